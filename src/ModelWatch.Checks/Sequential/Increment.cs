using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Sequential;

/// <summary>
/// The rows new since the previous run: the increment the sequential statistics consume, once each. Successive
/// increments are disjoint, so statistics computed on them (against everything consumed before) are independent from
/// run to run when nothing changes, whatever the ratio of window to cadence.
/// </summary>
public static class Increment
{
    /// <summary>The increment's factor, or null when no new rows came.</summary>
    public static AugmentedFactor? Of(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        return input.Window.NewRows is { RowCount: > 0 } rows ? rows : null;
    }

    /// <summary>
    /// A skipped finding when the window overlaps the previous run's but every row came marked new: counting rows twice
    /// would make successive inputs dependent and the false-alarm rate unknown, so the sequential statistics wait.
    /// </summary>
    public static Finding? Unmarked(CheckInput input, string check, string statistic)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        AugmentedFactor? fresh = input.Window.NewRows;
        bool unmarked = fresh is not null && state.LastRunEnd is { } lastEnd && input.WindowStart < lastEnd
            && fresh.RowCount == input.Window.RowsAccepted && state.Runs > 0;
        return unmarked
            ? Skip(check, statistic, SkipReasons.RowsNotMarked, "the window overlaps the previous run's but no row was marked as already seen (AddRow newSinceLastRun: false), so the sequential statistics cannot tell new rows from old ones")
            : null;
    }
}
