namespace ModelWatch.Daemon.Web;

/// <summary>One model on the fleet page, as <c>modelwatch status</c> shows it.</summary>
internal sealed class FleetRow
{
    public string Key { get; set; } = string.Empty;

    public bool Enabled { get; set; }

    public DateTime? LastRunSlot { get; set; }

    public string? LastRunStatus { get; set; }

    /// <summary>critical, warning, ok, or null when the last run has no findings.</summary>
    public string? WorstSeverity { get; set; }

    public int OpenCritical { get; set; }

    public int OpenWarning { get; set; }

    public DateTime? QuietUntil { get; set; }

    public int? BaselineVersion { get; set; }

    public DateTime? BaselineCreatedAt { get; set; }

    public int ConsecutiveFailedRuns { get; set; }
}
