using System.Globalization;

namespace ModelWatch.Daemon.Evidence;

/// <summary>Facts and number formats shared by the terminal and HTML forms of the evidence, so both say the same thing.</summary>
internal static class EvidenceFacts
{
    /// <summary>Features (and terms) that a non-ok finding of the run names, strongest first.</summary>
    public static IReadOnlyList<string> FeaturesInvolved(EvidenceRun run)
    {
        var named = new List<(string Name, int Rank)>();
        foreach (EvidenceFinding f in run.Findings.Where(f => f.Severity != "ok" && f.Skipped is null))
        {
            int rank = f.Severity == "critical" ? 0 : 1;
            if (f.Subject is { } subject)
            {
                named.Add((subject, rank));
            }

            // The condition-number finding names a near-dependency through its variance-decomposition proportions.
            named.AddRange(f.Details.Where(d => d.Key.StartsWith("proportion.", StringComparison.Ordinal) && d.Value >= 0.5)
                .Select(d => (d.Key["proportion.".Length..], rank)));
        }

        return [.. named.Where(n => n.Name != "(intercept)").GroupBy(n => n.Name).OrderBy(g => g.Min(n => n.Rank)).ThenBy(g => g.Key, StringComparer.Ordinal).Select(g => g.Key)];
    }

    /// <summary>Why the shares of the error decomposition can be negative or above 100 %, said wherever they are printed.</summary>
    public const string SharesExplained =
        "How to read the shares: the deployed model's mean squared error (MSE) rose over the baseline's, and the increase is split " +
        "into three parts that add up to 100 %. Noise is the change in the window's own unavoidable error (the refit's MSE minus " +
        "the baseline's); level drift is the squared average offset of the predictions; slope drift is what the moved coefficients " +
        "add beyond that offset. The drift parts cannot be negative, but noise can: a window less noisy than the baseline gives a " +
        "negative noise share, and then the drift parts together exceed 100 % because the parts partly cancel. " +
        "Large drift shares point at the coefficients (the model is out of date); a large noise share points at the data.";

    /// <summary>A number to four significant digits.</summary>
    public static string Num(double value) => value.ToString("G4", CultureInfo.InvariantCulture);

    /// <summary>A share as a whole percentage (no "-0 %").</summary>
    public static string Pct(double share) => (Math.Round(share * 100) + 0.0).ToString("F0", CultureInfo.InvariantCulture) + " %";

    /// <summary>An instant as ISO 8601 UTC to the second, or null.</summary>
    public static string? Time(DateTimeOffset? value) =>
        value?.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    /// <summary>A stored UTC time as ISO 8601 to the second, or null.</summary>
    public static string? Time(DateTime? utc) =>
        utc is { } t ? DateTime.SpecifyKind(t, DateTimeKind.Utc).ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture) : null;

    /// <summary>An instant for people: <c>2026-04-02 06:00 UTC</c>.</summary>
    public static string Readable(DateTimeOffset value) =>
        value.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture) + " UTC";
}
