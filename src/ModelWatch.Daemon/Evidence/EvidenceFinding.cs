namespace ModelWatch.Daemon.Evidence;

/// <summary>A stored finding with its numeric details parsed.</summary>
internal sealed record EvidenceFinding(
    long RunId,
    string Check,
    string? Subject,
    string Statistic,
    double? Value,
    double? PValue,
    double? Threshold,
    double? EffectSize,
    string Severity,
    string Explanation,
    IReadOnlyDictionary<string, double> Details,
    string? Skipped)
{
    /// <summary>A numeric detail, or null when absent.</summary>
    public double? Detail(string name) => Details.TryGetValue(name, out double v) && double.IsFinite(v) ? v : null;

    /// <summary>The subject, or "model" for a finding about the model as a whole.</summary>
    public string SubjectText => Subject ?? "model";
}
