namespace ModelWatch.Daemon.Evidence;

/// <summary>A finding row as Dapper reads it, before its details are parsed.</summary>
internal sealed class EvidenceFindingRow
{
    public long RunId { get; set; }

    public string Check { get; set; } = string.Empty;

    public string? Subject { get; set; }

    public string Statistic { get; set; } = string.Empty;

    public double? Value { get; set; }

    public double? PValue { get; set; }

    public double? Threshold { get; set; }

    public double? EffectSize { get; set; }

    public string Severity { get; set; } = string.Empty;

    public string Explanation { get; set; } = string.Empty;

    public string Details { get; set; } = "{}";
}
