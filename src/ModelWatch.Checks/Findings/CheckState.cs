namespace ModelWatch.Checks.Findings;

/// <summary>
/// The state one check carries from run to run for one model: a plain document the store persists. It is
/// bound to a baseline by fingerprint; a new baseline starts from a fresh state.
/// </summary>
public sealed record CheckState
{
    /// <summary>Version of this document's shape.</summary>
    public int SchemaVersion { get; init; } = 1;

    /// <summary>Fingerprint of the baseline this state belongs to.</summary>
    public string? BaselineFingerprint { get; init; }

    /// <summary>End of the last window the fixed-sample tests used; the next test needs a window starting at or after it.</summary>
    public DateTimeOffset? LastTestedWindowEnd { get; init; }

    /// <summary>Upper one-sided Page CUSUM.</summary>
    public double CusumUpper { get; init; }

    /// <summary>Lower one-sided Page CUSUM.</summary>
    public double CusumLower { get; init; }

    /// <summary>Upper one-sided Page CUSUM of the per-run variance statistic.</summary>
    public double VarianceCusumUpper { get; init; }

    /// <summary>Lower one-sided Page CUSUM of the per-run variance statistic.</summary>
    public double VarianceCusumLower { get; init; }

    /// <summary>Variance CUSUM alarms since the baseline.</summary>
    public int VarianceCusumAlarms { get; init; }

    /// <summary>Runs the CUSUM has taken since the baseline (or since its last alarm).</summary>
    public long CusumRuns { get; init; }

    /// <summary>CUSUM alarms since the baseline.</summary>
    public int CusumAlarms { get; init; }

    /// <summary>
    /// Factor T of the baseline's reference rows plus every new row consumed since (row-major rows): the fit each
    /// run's new rows are predicted from, which makes successive CUSUM inputs independent under no change.
    /// </summary>
    public double[][]? SequentialFactor { get; init; }

    /// <summary>Rows in <see cref="SequentialFactor"/>.</summary>
    public long SequentialRowCount { get; init; }

    /// <summary>End of the previous run's window (the CUSUM uses it to recognise rows it has already consumed).</summary>
    public DateTimeOffset? LastRunEnd { get; init; }

    /// <summary>Consecutive runs that read no rows (a quiet source).</summary>
    public int ConsecutiveEmptyRuns { get; init; }

    /// <summary>A fresh state for a baseline.</summary>
    public static CheckState For(string baselineFingerprint) => new() { BaselineFingerprint = baselineFingerprint };
}
