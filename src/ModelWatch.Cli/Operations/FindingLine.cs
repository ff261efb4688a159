using System.Text.Json;
using ModelWatch.Checks.Findings;
using ModelWatch.Cli.Output;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// A finding as <c>check</c> and <c>backtest</c> print it. Only tests that ran are listed: a skipped test is never
/// shown as <c>ok</c> (docs/checks.md); skipped tests are counted separately with their reasons.
/// </summary>
internal sealed record FindingLine(string Check, string? Subject, Severity Severity, string Statistic, double? Value, double? Threshold, double? PValue, double? Alpha, double? Limit, string Explanation)
{
    public string SeverityName => NameOf(Severity);

    public static string NameOf(Severity severity) => severity switch
    {
        Severity.Critical => "critical",
        Severity.Warning => "warning",
        _ => "ok",
    };

    /// <summary>The findings of tests that ran, worst first, then by check and subject.</summary>
    public static IReadOnlyList<FindingLine> Of(IEnumerable<CheckResult> results) =>
        [.. results.SelectMany(r => r.Findings)
            .Where(f => !f.Skipped)
            .OrderByDescending(f => f.Severity)
            .ThenBy(f => f.Check, StringComparer.Ordinal)
            .ThenBy(f => f.Subject ?? string.Empty, StringComparer.Ordinal)
            .Select(f => new FindingLine(f.Check, f.Subject, f.Severity, f.Statistic, f.Value, f.Threshold, f.PValue, f.Alpha, f.Limit, f.Explanation))];

    /// <summary>Skipped tests by reason, for the table's note.</summary>
    public static IReadOnlyDictionary<string, int> Skipped(IEnumerable<CheckResult> results) =>
        results.SelectMany(r => r.Findings)
            .Where(f => f.Skipped)
            .GroupBy(f => f.SkipReason ?? "skipped", StringComparer.Ordinal)
            .OrderBy(g => g.Key, StringComparer.Ordinal)
            .ToDictionary(g => g.Key, g => g.Count(), StringComparer.Ordinal);

    /// <summary>The worst severity among the lines, or null when there are none.</summary>
    public static Severity? Worst(IReadOnlyList<FindingLine> lines) => lines.Count == 0 ? null : lines.Max(l => l.Severity);

    public static void WriteArray(Utf8JsonWriter writer, IEnumerable<FindingLine> lines)
    {
        writer.WriteStartArray("findings");
        foreach (FindingLine line in lines)
        {
            writer.WriteStartObject();
            writer.WriteString("check", line.Check);
            writer.WriteString("subject", line.Subject);
            writer.WriteString("severity", line.SeverityName);
            writer.WriteString("statistic", line.Statistic);
            JsonNumbers.WriteTest(writer, line.Value, line.Threshold, line.PValue, line.Alpha, line.Limit);
            writer.WriteString("explanation", line.Explanation);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
    }
}
