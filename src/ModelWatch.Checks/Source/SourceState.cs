namespace ModelWatch.Checks.Source;

/// <summary>The <c>source</c> check's memory: the failures in a row and the newest row any run has seen.</summary>
/// <param name="ConsecutiveFailures">Runs in a row that failed (0 after a run that read its window).</param>
/// <param name="FailingSince">Start of the first failed run in the current series, or null.</param>
/// <param name="LastError">The latest failure's reason, or null.</param>
/// <param name="NewestRowTime">The time of the newest row a run has read, or null before the first.</param>
public sealed record SourceState(int ConsecutiveFailures, DateTimeOffset? FailingSince, string? LastError, DateTimeOffset? NewestRowTime)
{
    /// <summary>A state with no failures and no row seen.</summary>
    public SourceState()
        : this(0, null, null, null)
    {
    }
}
