using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Daemon.Runs;

/// <summary>Everything one run produced, ready to be written in one transaction.</summary>
public sealed record RunOutcome
{
    /// <summary>The model key.</summary>
    public required string ModelKey { get; init; }

    /// <summary>The schedule slot the run belongs to.</summary>
    public required DateTimeOffset Slot { get; init; }

    /// <summary>How the run ended.</summary>
    public required RunStatus Status { get; init; }

    /// <summary>Why the run failed or was skipped (null for ok).</summary>
    public string? Reason { get; init; }

    /// <summary>The baseline version used.</summary>
    public int? BaselineVersion { get; init; }

    /// <summary>The baseline's fingerprint (states belong to it).</summary>
    public string? BaselineFingerprint { get; init; }

    /// <summary>Start of the window read (inclusive).</summary>
    public DateTimeOffset? WindowStart { get; init; }

    /// <summary>End of the window read (exclusive).</summary>
    public DateTimeOffset? WindowEnd { get; init; }

    /// <summary>Rows read from the source.</summary>
    public long RowsRead { get; init; }

    /// <summary>Rows left out.</summary>
    public long RowsRejected { get; init; }

    /// <summary>Rejected rows by reason.</summary>
    public IReadOnlyDictionary<string, long> RejectedReasons { get; init; } = new Dictionary<string, long>();

    /// <summary>Seconds spent per stage (read, fit, checks).</summary>
    public IReadOnlyDictionary<string, double> StageSeconds { get; init; } = new Dictionary<string, double>();

    /// <summary>When the run started.</summary>
    public required DateTimeOffset StartedAt { get; init; }

    /// <summary>Check results (empty for failed or skipped runs).</summary>
    public IReadOnlyList<CheckResult> Results { get; init; } = [];

    /// <summary>Alert policy decisions.</summary>
    public IReadOnlyList<AlertDecision> Decisions { get; init; } = [];

    /// <summary>What the window measured for the per-model gauges (null when the run measured nothing).</summary>
    public RunMeasurements? Measurements { get; init; }

    /// <summary>The time of the newest row the source delivered in the window, or null.</summary>
    public DateTimeOffset? NewestRowTime { get; init; }

    /// <summary>The failure's class for the <c>error.type</c> attribute (an SQLSTATE or exception name).</summary>
    public string? ErrorType { get; init; }
}
