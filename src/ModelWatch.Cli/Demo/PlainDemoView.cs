using ModelWatch.Daemon.Persistence;

namespace ModelWatch.Cli.Demo;

/// <summary>Progress as plain lines, one per simulated day, for pipes, files and tests.</summary>
internal sealed class PlainDemoView(TextWriter output) : IDemoView
{
    private DateTimeOffset _shownDay = DemoScenario.BaselineEnd;

    public void Transition(ModelAlertEvent transition) => output.WriteLine(DemoSummary.Describe(transition));

    public void Tick(DateTimeOffset now, RunTally tally)
    {
        ArgumentNullException.ThrowIfNull(tally);
        while (_shownDay.AddDays(1) <= now && _shownDay < DemoScenario.DataEnd)
        {
            _shownDay = _shownDay.AddDays(1);
            output.WriteLine($"  {DemoRunner.Day(_shownDay)}  runs {tally.Total,3}/{DemoScenario.ExpectedRuns}  {DemoScenario.PhaseOf(_shownDay.AddDays(-1))}");
        }
    }
}
