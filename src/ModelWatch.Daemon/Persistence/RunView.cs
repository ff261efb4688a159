namespace ModelWatch.Daemon.Persistence;

/// <summary>A recorded run as operators list it.</summary>
public sealed class RunView
{
    /// <summary>Run id.</summary>
    public long Id { get; set; }

    /// <summary>Model key.</summary>
    public string Model { get; set; } = string.Empty;

    /// <summary>Schedule slot (UTC).</summary>
    public DateTime Slot { get; set; }

    /// <summary>Window start (UTC).</summary>
    public DateTime? WindowStart { get; set; }

    /// <summary>Window end (UTC, exclusive).</summary>
    public DateTime? WindowEnd { get; set; }

    /// <summary>ok, failed, skipped.</summary>
    public string Status { get; set; } = string.Empty;

    /// <summary>Why it failed or was skipped.</summary>
    public string? Reason { get; set; }

    /// <summary>Baseline version used.</summary>
    public int? BaselineVersion { get; set; }

    /// <summary>Rows read.</summary>
    public long RowsRead { get; set; }

    /// <summary>Rows rejected.</summary>
    public long RowsRejected { get; set; }

    /// <summary>The replica that ran it.</summary>
    public string Worker { get; set; } = string.Empty;

    /// <summary>When it started (UTC).</summary>
    public DateTime StartedAt { get; set; }

    /// <summary>When it was recorded (UTC).</summary>
    public DateTime? FinishedAt { get; set; }

    /// <summary>Stage timings as stored (JSON object of seconds).</summary>
    public string StageTimings { get; set; } = "{}";
}
