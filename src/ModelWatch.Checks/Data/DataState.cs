namespace ModelWatch.Checks.Data;

/// <summary>The data check's memory: how many runs in a row brought no new usable rows.</summary>
public sealed record DataState
{
    /// <summary>Consecutive runs that read no new rows (a quiet source).</summary>
    public int ConsecutiveEmptyRuns { get; init; }
}
