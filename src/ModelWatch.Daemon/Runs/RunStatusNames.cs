namespace ModelWatch.Daemon.Runs;

/// <summary>The stored and reported names of <see cref="RunStatus"/>: the run table, metrics and JSON output use them.</summary>
public static class RunStatusNames
{
    /// <summary>The name of a status.</summary>
    public static string Name(this RunStatus status) => status switch
    {
        RunStatus.Ok => "ok",
        RunStatus.Failed => "failed",
        RunStatus.Skipped => "skipped",
        _ => throw new ArgumentOutOfRangeException(nameof(status), status, "unknown run status"),
    };
}
