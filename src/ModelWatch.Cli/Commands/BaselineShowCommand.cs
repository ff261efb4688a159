using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Checks.Summaries;
using ModelWatch.Cli.Operations;
using ModelWatch.Cli.Output;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch baseline show KEY [--version N] [--format table|json]</c>: one version (the active one by default) with
/// its coefficients in the spec's order, what its reference sample holds and which tests that enables.
/// </summary>
internal static class BaselineShowCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var version = new Option<int?>("--version") { Description = "The version to show (default: the active one)" };
        var format = OperationOptions.Format();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("show", "Show one baseline version: coefficients, reference statistics and the tests it enables") { key, version, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline show", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            string model = parse.GetRequiredValue(key);
            var repository = new BaselineRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            BaselineVersions versions = await BaselineOutput.VersionsAsync(repository, model, ct);
            StoredBaseline baseline = await BaselineOutput.VersionAsync(repository, model, versions, parse.GetValue(version), ct);
            bool active = baseline.Version == versions.Active;
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, baseline, active));
            }
            else
            {
                WriteTable(output, baseline, active, versions);
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void WriteTable(TextWriter output, StoredBaseline baseline, bool active, BaselineVersions versions)
    {
        BaselineReference r = baseline.Reference;
        string status = active ? "active" : $"not active; version {versions.Active} is";
        output.WriteLine($"model:            {baseline.ModelKey}");
        output.WriteLine(Invariant($"baseline:         version {baseline.Version} ({status})"));
        output.WriteLine($"origin:           {BaselineOutput.Origin(r)}");
        output.WriteLine($"created:          {CliJson.Time(baseline.CreatedAt)} by {baseline.CreatedBy}");
        output.WriteLine($"design:           {baseline.DesignSignature}");
        output.WriteLine($"reference window: {BaselineOutput.Window(baseline)}");
        output.WriteLine(Invariant($"rows:             {r.RowCount}"));
        output.WriteLine(Invariant($"residual SD:      {BaselineOutput.Number(r.ResidualStandardDeviation)} on {r.ResidualDegreesOfFreedom} df"));
        output.WriteLine($"condition number: {(r.ConditionNumber is null ? "unknown (no reference rows)" : BaselineOutput.Number(r.ConditionNumber))}");
        output.WriteLine($"fingerprint:      {r.Fingerprint}");
        output.WriteLine();

        double?[] errors = BaselineOutput.StandardErrors(r);
        IReadOnlyList<string> terms = r.ToLayout().Terms;
        List<string[]> rows = [["TERM", "COEFFICIENT", "STD ERROR"]];
        for (int i = 0; i < terms.Count; i++)
        {
            rows.Add([terms[i], r.Coefficients[terms[i]].ToString("G8", CultureInfo.InvariantCulture), BaselineOutput.Number(errors[i])]);
        }

        CliJson.WriteTable(output, rows);
        output.WriteLine();
        output.WriteLine($"reference sample: {Sample(r)}");
        output.WriteLine("tests this baseline enables:");
        foreach (BaselineCapability capability in BaselineCapabilities.Of(r))
        {
            output.WriteLine($"  {(capability.Available ? "yes" : "no "),-3}  {capability.Tests} (needs {capability.Needs})");
        }
    }

    private static string Sample(BaselineReference r)
    {
        if (r.SampleSize == 0 && r.Factor is null)
        {
            return "none (imported without a reference window): the tests marked 'no' below are skipped on every run";
        }

        string bins = r.FeatureBins.Count == 0 ? "no feature bins" : Invariant($"quantile bins of {r.FeatureBins.Count} feature(s)");
        string leverage = r.LeverageThreshold is null ? "no leverage quantiles" : "leverage quantiles";
        return Invariant(
            $"{r.SampleSize} row(s) sampled (seed {r.Seed}): {r.ResidualSample.Count} standardized residual(s), values of {r.FeatureSamples.Count(f => f.Length > 0)} feature(s), {bins}, {leverage}; factor of {r.FactorRowCount} reference row(s)");
    }

    private static void WriteJson(Utf8JsonWriter writer, StoredBaseline baseline, bool active)
    {
        BaselineReference r = baseline.Reference;
        writer.WriteStartObject();
        writer.WriteString("model", baseline.ModelKey);
        writer.WriteNumber("version", baseline.Version);
        writer.WriteBoolean("active", active);
        writer.WriteString("origin", BaselineOutput.Origin(r));
        writer.WriteString("created_at", CliJson.Time(baseline.CreatedAt));
        writer.WriteString("created_by", baseline.CreatedBy);
        writer.WriteString("design", baseline.DesignSignature);
        BaselineOutput.WriteWindow(writer, baseline);
        writer.WriteNumber("row_count", r.RowCount);
        JsonNumbers.Write(writer, "residual_sd", r.ResidualStandardDeviation);
        writer.WriteNumber("residual_df", r.ResidualDegreesOfFreedom);
        JsonNumbers.Write(writer, "condition_number", r.ConditionNumber);
        writer.WriteString("fingerprint", r.Fingerprint);

        double?[] errors = BaselineOutput.StandardErrors(r);
        IReadOnlyList<string> terms = r.ToLayout().Terms;
        writer.WriteStartArray("coefficients");
        for (int i = 0; i < terms.Count; i++)
        {
            writer.WriteStartObject();
            writer.WriteString("term", terms[i]);
            JsonNumbers.Write(writer, "estimate", r.Coefficients[terms[i]]);
            JsonNumbers.Write(writer, "std_error", errors[i]);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteStartObject("reference_sample");
        writer.WriteNumber("rows_sampled", r.SampleSize);
        writer.WriteNumber("residuals", r.ResidualSample.Count);
        writer.WriteNumber("features_sampled", r.FeatureSamples.Count(f => f.Length > 0));
        writer.WriteNumber("features_binned", r.FeatureBins.Count);
        writer.WriteBoolean("leverage_quantiles", r.LeverageThreshold is not null);
        writer.WriteNumber("factor_rows", r.FactorRowCount);
        writer.WriteEndObject();
        writer.WriteStartArray("tests");
        foreach (BaselineCapability capability in BaselineCapabilities.Of(r))
        {
            writer.WriteStartObject();
            writer.WriteString("tests", capability.Tests);
            writer.WriteString("needs", capability.Needs);
            writer.WriteBoolean("enabled", capability.Available);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteEndObject();
    }

    private static string Invariant(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
