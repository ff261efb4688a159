using System.Text.Json;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Daemon.Persistence;

/// <summary>A finding as the <c>modelwatch.finding</c> table stores it.</summary>
internal sealed record FindingRow(
    long RunId,
    string Check,
    string? Subject,
    string Statistic,
    double? Value,
    double? PValue,
    double? Threshold,
    double? Alpha,
    double? Limit,
    double? EffectSize,
    string Severity,
    string Explanation,
    string Details)
{
    public static FindingRow From(long runId, Finding finding)
    {
        var details = new Dictionary<string, object?>(StringComparer.Ordinal);
        foreach ((string name, double value) in finding.Details)
        {
            details[name] = value;
        }

        if (finding.Skipped)
        {
            details["skipped"] = finding.SkipReason ?? "skipped";
        }

        if (finding.EffectSizeName is not null)
        {
            details["effect_size_name"] = finding.EffectSizeName;
        }

        details["requires_persistence"] = finding.RequiresPersistence;
        return new FindingRow(
            runId,
            finding.Check,
            finding.Subject,
            finding.Statistic,
            Finite(finding.Value),
            Finite(finding.PValue),
            Finite(finding.Threshold),
            Finite(finding.Alpha),
            Finite(finding.Limit),
            Finite(finding.EffectSize),
            SeverityName(finding.Severity),
            finding.Explanation,
            JsonSerializer.Serialize(details, StateJson.Options));
    }

    public static string SeverityName(Severity severity) => severity switch
    {
        Checks.Findings.Severity.Critical => "critical",
        Checks.Findings.Severity.Warning => "warning",
        _ => "ok",
    };

    /// <summary>The value, or null when it is missing or not finite (the state tables hold no NaN).</summary>
    public static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;
}
