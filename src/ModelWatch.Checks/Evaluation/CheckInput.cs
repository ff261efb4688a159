using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Checks.Evaluation;

/// <summary>Everything a check reads: the baseline, the window's summary and bounds, the check's persisted state and the model's settings.</summary>
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

    /// <summary>The time of the newest row the source delivered in the window (any row, rejected ones too), or null.</summary>
    public DateTimeOffset? NewestRowTime { get; init; }

    /// <summary>This check's state from the previous run; null (or another baseline's, or an older shape) starts afresh.</summary>
    public CheckState? State { get; init; }

    /// <summary>The model's settings.</summary>
    public CheckThresholds Thresholds { get; init; } = new();

    /// <summary>The state to continue from: the given one when it belongs to this baseline and shape, else a fresh one.</summary>
    public CheckState CurrentState =>
        State is { SchemaVersion: CheckState.CurrentSchemaVersion } s && s.BaselineFingerprint == Baseline.Fingerprint ? s : CheckState.For(Baseline.Fingerprint);

    /// <summary>Usable rows the regression tests need.</summary>
    public int MinimumRows => Thresholds.MinimumRows ?? Math.Max(30, 10 * Baseline.ToLayout().ParameterCount);

    /// <summary>The value of one of the check's settings.</summary>
    public double Setting(CheckSetting setting) => Thresholds.Value(setting);

    /// <summary>α of one of <paramref name="tests"/> per-run tests sharing a channel.</summary>
    public double RunAlpha(int tests = 1) => FalseAlarmBudget.RunAlpha(Thresholds, tests);
}
