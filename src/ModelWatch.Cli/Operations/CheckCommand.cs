using System.CommandLine;
using ModelWatch.Checks.Findings;
using ModelWatch.Cli.Commands;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Runs;
using ModelWatch.Store.Models;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// <c>modelwatch check KEY [--at T] [--format table|json] [--fail-on warning|critical] [--record]</c>: one run of the
/// slot at or before <c>--at</c> through the daemon's pipeline. For the current slot (no <c>--at</c>) it continues from
/// the live run memory but writes nothing; for a past slot it replays the windows before it as <c>backtest</c> does
/// (<see cref="CheckReplay"/>); with <c>--record</c> the run is recorded as a replica would record it, in slot order
/// only (<see cref="CheckRecording.EnsureInOrderAsync"/>).
/// </summary>
internal static class CheckCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "Model key" };
        var at = OperationOptions.Time("--at", "Run the slot at or before this time (default: now); a past slot is evaluated as it stood then, by replaying the windows since the baseline's reference window", required: false);
        var format = OperationOptions.Format();
        var failOn = new Option<string?>("--fail-on") { Description = "Exit with code 1 when a finding is at or above this severity: warning or critical" };
        failOn.Validators.Add(result =>
        {
            string text = result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
            if (text is not ("warning" or "critical"))
            {
                result.AddError($"--fail-on: '{text}' is not a severity to fail on; use warning or critical");
            }
        });
        var record = new Option<bool>("--record") { Description = "Record the run, its findings and alert transitions as the daemon would (without it nothing is written)" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("check", "Run a model's checks once for one slot and print the findings") { key, at, format, failOn, record, database };
        command.SetAction((parse, cancellationToken) => OperationServices.RunAsync(parse, "check", database, async (services, output, ct) =>
        {
            ModelRecord model = await services.ModelAsync(parse.GetRequiredValue(key), ct);
            DateTimeOffset now = services.Time.GetUtcNow();
            DateTimeOffset time = parse.GetValue(at) ?? now;
            DateTimeOffset slot = model.Spec.Schedule.SlotAtOrBefore(time)
                ?? throw new OperationException($"model {model.Key}: schedule '{model.Spec.Schedule}' has no slot in the year before {CliJson.Time(time)}");

            RunOutcome outcome;
            string? note = null;
            if (parse.GetValue(record))
            {
                await CheckRecording.EnsureInOrderAsync(services, model, slot, ct);
                (outcome, note) = await CheckRecording.RunAsync(services, model, slot, ct);
            }
            else if (CheckReplay.IsPast(model, slot, now))
            {
                (outcome, note) = await CheckReplay.RunAsync(services, output, model, slot, ct);
            }
            else
            {
                outcome = await services.Pipeline.ExecuteAsync(model, slot, await services.LiveMemoryAsync(model.Key, ct), ct);
            }

            IReadOnlyList<FindingLine> findings = FindingLine.Of(outcome.Results);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => CheckOutput.WriteJson(writer, outcome, findings));
            }
            else
            {
                CheckOutput.WriteTable(output, outcome, findings, FindingLine.Skipped(outcome.Results));
            }

            TextWriter error = parse.InvocationConfiguration.Error;
            if (note is not null)
            {
                await error.WriteLineAsync($"modelwatch check: {note}");
            }

            if (outcome.Status == RunStatus.Failed)
            {
                await error.WriteLineAsync($"modelwatch check: model {model.Key}: the run for slot {CliJson.Time(slot)} failed: {outcome.Reason}");
                return ExitCodes.RuntimeError;
            }

            Severity? limit = parse.GetValue(failOn) switch
            {
                "warning" => Severity.Warning,
                "critical" => Severity.Critical,
                _ => null,
            };
            return limit is { } l && FindingLine.Worst(findings) is { } worst && worst >= l ? ExitCodes.Findings : ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
