using ModelWatch.Daemon.Persistence;

namespace ModelWatch.Cli.Demo;

/// <summary>How the demo shows the daemon's progress while it runs: plain lines, or a live display on a terminal.</summary>
internal interface IDemoView
{
    /// <summary>An alert transition the daemon has just recorded.</summary>
    void Transition(ModelAlertEvent transition);

    /// <summary>The simulated time and the runs recorded so far (called a few times a second).</summary>
    void Tick(DateTimeOffset now, RunTally tally);
}
