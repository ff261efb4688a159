using System.CommandLine;
using ModelWatch.Cli.Commands;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Runs;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// <c>modelwatch backtest KEY --from T --to T [--every DURATION] [--format table|json]</c>: runs the daemon's pipeline
/// over past slots with the sequential and alert-policy state carried from window to window in process memory,
/// starting empty. It reads the data source and the baseline and writes nothing: live alerts and states are not
/// read or touched.
/// </summary>
internal static class BacktestCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "Model key" };
        var from = OperationOptions.Time("--from", "First slot", required: true);
        var to = OperationOptions.Time("--to", "Last slot (inclusive)", required: true);
        var every = OperationOptions.Every();
        var format = OperationOptions.Format();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("backtest", "Run a model's checks over past windows as the daemon would and list the alerts that would have opened and resolved")
        {
            key, from, to, every, format, database,
        };
        command.Validators.Add(result =>
        {
            // Read the tokens, not the values: a value that failed to parse has its own error already.
            if (OperationOptions.TryTime(result.GetResult(from)) is { } f && OperationOptions.TryTime(result.GetResult(to)) is { } t && t < f)
            {
                result.AddError($"--to ({CliJson.Time(t)}) is before --from ({CliJson.Time(f)})");
            }
        });
        command.SetAction((parse, cancellationToken) => OperationServices.RunAsync(parse, "backtest", database, async (services, output, ct) =>
        {
            ModelRecord model = await services.ModelAsync(parse.GetRequiredValue(key), ct);
            DateTimeOffset start = parse.GetValue(from)!.Value;
            DateTimeOffset end = parse.GetValue(to)!.Value;
            Duration? step = parse.GetValue(every);
            IReadOnlyList<DateTimeOffset> slots = BacktestSlots.Between(model.Key, model.Spec.Schedule, start, end, step);
            if (slots.Count == 0)
            {
                throw new OperationException($"model {model.Key}: schedule '{model.Spec.Schedule}' has no slot between {CliJson.Time(start)} and {CliJson.Time(end)}");
            }

            var memory = new InMemoryRunMemory();
            var timeline = new AlertTimeline();
            var windows = new List<BacktestWindow>(slots.Count);
            await Terminal.ProgressAsync(output, $"backtest {model.Key}", slots.Count, async advance =>
            {
                foreach (DateTimeOffset slot in slots)
                {
                    RunOutcome outcome = await services.Pipeline.ExecuteAsync(model, slot, memory, ct);
                    memory.Remember(outcome);
                    timeline.Apply(slot, outcome.Decisions);
                    windows.Add(new BacktestWindow(slot, outcome.WindowStart, outcome.WindowEnd, outcome.Status.Name(), outcome.Reason, FindingLine.Of(outcome.Results)));
                    advance();
                }
            });

            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => BacktestOutput.WriteJson(writer, model.Key, windows, timeline.Alerts));
            }
            else
            {
                BacktestOutput.WriteTable(output, model, step, windows, timeline.Alerts);
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
