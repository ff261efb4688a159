using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Checks.Evaluation;

/// <summary>Everything a check reads: the baseline, the window's summary and bounds, the check's persisted state and the model's thresholds.</summary>
public sealed record CheckInput
{
    /// <summary>The baseline.</summary>
    public required BaselineReference Baseline { get; init; }

    /// <summary>The window's summary.</summary>
    public required WindowSummary Window { get; init; }

    /// <summary>Start of the window (inclusive).</summary>
    public required DateTimeOffset WindowStart { get; init; }

    /// <summary>End of the window (exclusive).</summary>
    public required DateTimeOffset WindowEnd { get; init; }

    /// <summary>This check's state from the previous run; null (or another baseline's) starts afresh.</summary>
    public CheckState? State { get; init; }

    /// <summary>The model's thresholds.</summary>
    public CheckThresholds Thresholds { get; init; } = new();

    /// <summary>The state to continue from: the given one when it belongs to this baseline, else a fresh one.</summary>
    internal CheckState CurrentState =>
        State is not null && State.BaselineFingerprint == Baseline.Fingerprint ? State : CheckState.For(Baseline.Fingerprint);

    /// <summary>True when this window does not overlap the last one the fixed-sample tests used.</summary>
    internal bool FixedSampleDue => CurrentState.LastTestedWindowEnd is not { } last || WindowStart >= last;

    /// <summary>The budgeted α of each fixed-sample test.</summary>
    internal double Alpha => FalseAlarmBudget.FixedSampleAlpha(Thresholds);

    /// <summary>Usable rows the regression tests need.</summary>
    internal int MinimumRows => Thresholds.MinimumRows ?? Math.Max(30, 10 * Baseline.ToLayout().ParameterCount);
}
