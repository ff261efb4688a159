using ModelWatch.Daemon.Persistence;
using Spectre.Console;

namespace ModelWatch.Cli.Demo;

/// <summary>Progress on a terminal: a live bar with the simulated date and runs, alert transitions printed above it.</summary>
internal sealed class LiveDemoView(IAnsiConsole console, ProgressTask task) : IDemoView
{
    public static async Task<RunTally> RunAsync(Func<IDemoView, Task<RunTally>> body)
    {
        IAnsiConsole console = AnsiConsole.Console;
        RunTally? result = null;
        await console.Progress()
            .AutoClear(false)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new ElapsedTimeColumn())
            .StartAsync(async context =>
            {
                ProgressTask task = context.AddTask("starting the daemon", maxValue: DemoScenario.ExpectedRuns);
                result = await body(new LiveDemoView(console, task));
                task.Value = result.Total;
            });
        return result!;
    }

    public void Transition(ModelAlertEvent transition)
    {
        ArgumentNullException.ThrowIfNull(transition);
        string colour = transition.Transition == "resolved" ? "green" : transition.Severity == "critical" ? "red" : "yellow";
        console.MarkupLine($"[{colour}]{Markup.Escape(DemoSummary.Describe(transition))}[/]");
    }

    public void Tick(DateTimeOffset now, RunTally tally)
    {
        ArgumentNullException.ThrowIfNull(tally);
        task.Value = tally.Total;
        task.Description = Markup.Escape($"{DemoRunner.Stamp(now)}  runs {tally.Total}/{DemoScenario.ExpectedRuns}  {DemoScenario.PhaseOf(now)}");
    }
}
