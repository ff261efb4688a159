namespace ModelWatch.Checks.Findings;

/// <summary>Machine-readable reasons a test did not run (the explanation says it in words).</summary>
public static class SkipReasons
{
    /// <summary>The window has fewer usable rows than the model's minimum.</summary>
    public const string InsufficientData = "insufficient_data";

    /// <summary>The baseline lacks what the test needs (covariance, factor, samples, bins).</summary>
    public const string BaselineIncomplete = "baseline_incomplete";

    /// <summary>
    /// Written by versions before every run was tested: the window overlapped the last tested one. No check writes it now;
    /// it is kept because stored findings still carry it.
    /// </summary>
    public const string NotDue = "not_due";

    /// <summary>The window's refit is rank deficient, so its coefficients cannot be compared.</summary>
    public const string RankDeficient = "rank_deficient";

    /// <summary>The rows are not in time order, so serial-correlation tests do not apply.</summary>
    public const string NotTimeOrdered = "not_time_ordered";

    /// <summary>An overlapping window's rows were not marked new or already seen, so sequential statistics cannot run.</summary>
    public const string RowsNotMarked = "rows_not_marked";

    /// <summary>No served predictions came with the rows.</summary>
    public const string NoServedPredictions = "no_served_predictions";
}
