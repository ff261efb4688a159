namespace ModelWatch.Daemon.Runs;

/// <summary>How a run ended; stored and reported as <c>ok</c>, <c>failed</c> or <c>skipped</c> (see <see cref="RunStatusNames"/>).</summary>
public enum RunStatus
{
    /// <summary>The window was read and checked.</summary>
    Ok,

    /// <summary>The run could not read or check its window (a query error, a source that is down, bad settings).</summary>
    Failed,

    /// <summary>The run had nothing to check: too few rows, or no usable baseline.</summary>
    Skipped,
}
