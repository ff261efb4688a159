using System.CommandLine;
using System.Globalization;
using ModelWatch.Checks.Summaries;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary>What the baseline subcommands share: options, lookups that name what exists, and wording.</summary>
internal static class BaselineOutput
{
    public static Option<bool> KeepAlertsOption() => new("--keep-alerts")
    {
        Description = "Leave open the model's alerts raised against another baseline version; without it they are resolved as 'superseded'",
    };

    /// <summary>The model's versions, or a "no model" error (exit 3).</summary>
    public static async Task<BaselineVersions> VersionsAsync(BaselineRepository baselines, string modelKey, CancellationToken cancellationToken) =>
        await baselines.VersionsAsync(modelKey, cancellationToken) ?? throw new BaselineException($"no model '{modelKey}'");

    /// <summary>One stored version, or an error naming the versions that exist (exit 3).</summary>
    public static async Task<StoredBaseline> VersionAsync(BaselineRepository baselines, string modelKey, BaselineVersions versions, int? version, CancellationToken cancellationToken)
    {
        int? wanted = version ?? versions.Active;
        if (wanted is null)
        {
            throw new BaselineException($"model {modelKey} has no baseline; run 'modelwatch baseline fit' or 'modelwatch baseline import'");
        }

        return (versions.Versions.Contains(wanted.Value) ? await baselines.GetAsync(modelKey, wanted.Value, cancellationToken) : null)
            ?? throw new BaselineException($"model {modelKey} has no baseline version {wanted.Value.ToString(CultureInfo.InvariantCulture)} (versions: {versions.Describe()})");
    }

    /// <summary>What <c>baseline fit</c> and <c>baseline import</c> print: the version, its coefficients in the spec's order, and the alerts it superseded.</summary>
    public static void ReportStored(TextWriter output, ActivationOutcome outcome, BaselineReference reference)
    {
        output.WriteLine(Invariant(
            $"{outcome.ModelKey}: baseline version {outcome.Version} ({Origin(reference)}, n = {reference.RowCount}, residual SD = {reference.ResidualStandardDeviation:G6}, {reference.SampleSize} reference row(s) sampled); now the active version"));
        double?[] errors = StandardErrors(reference);
        IReadOnlyList<string> terms = reference.ToLayout().Terms;
        for (int i = 0; i < terms.Count; i++)
        {
            string se = errors[i] is { } s ? Invariant($"  (SE {s:G6})") : string.Empty;
            output.WriteLine(Invariant($"  {terms[i],-24} {reference.Coefficients[terms[i]],14:G8}{se}"));
        }

        WriteAlerts(output, outcome);
    }

    /// <summary>The superseded (or, with <c>--keep-alerts</c>, kept) alerts, one line.</summary>
    public static void WriteAlerts(TextWriter output, ActivationOutcome outcome)
    {
        if (outcome.Superseded.Count > 0)
        {
            output.WriteLine($"{Alerts(outcome.Superseded)} superseded (raised against another baseline; resolved, notifications queued)");
        }
        else if (outcome.Kept.Count > 0)
        {
            output.WriteLine($"{Alerts(outcome.Kept)} raised against another baseline left open (--keep-alerts); they still describe the old comparison");
        }
    }

    /// <summary>Standard errors in term order: from the covariance when stored, else as imported; null where unknown.</summary>
    public static double?[] StandardErrors(BaselineReference reference)
    {
        int p = reference.ToLayout().ParameterCount;
        return [.. Enumerable.Range(0, p).Select(j =>
        {
            double value = reference.Covariance is { } c ? Math.Sqrt(c[j][j])
                : reference.StandardErrors is { } s && j < s.Length ? s[j]
                : double.NaN;
            return double.IsFinite(value) ? value : (double?)null;
        })];
    }

    public static string Origin(BaselineReference reference) => reference.Origin == BaselineOrigin.Fitted ? "fitted" : "imported";

    public static string Window(StoredBaseline baseline) =>
        baseline.ReferenceWindowStart is { } start && baseline.ReferenceWindowEnd is { } end
            ? $"{CliJson.Time(start)} to {CliJson.Time(end)}"
            : "none";

    public static string Number(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("G6", CultureInfo.InvariantCulture) : "-";

    public static void WriteWindow(System.Text.Json.Utf8JsonWriter writer, StoredBaseline baseline)
    {
        if (baseline.ReferenceWindowStart is { } start && baseline.ReferenceWindowEnd is { } end)
        {
            writer.WriteStartObject("reference_window");
            writer.WriteString("start", CliJson.Time(start));
            writer.WriteString("end", CliJson.Time(end));
            writer.WriteEndObject();
        }
        else
        {
            writer.WriteNull("reference_window");
        }
    }

    private static string Alerts(IReadOnlyList<long> ids) =>
        (ids.Count == 1 ? "alert " : "alerts ") + string.Join(", ", ids.Select(id => "#" + id.ToString(CultureInfo.InvariantCulture)));

    private static string Invariant(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
