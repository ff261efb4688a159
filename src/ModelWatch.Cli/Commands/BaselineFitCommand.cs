using System.CommandLine;
using ModelWatch.Cli.Operations;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch baseline fit KEY --from T --to T [--keep-alerts]</c>.</summary>
internal static class BaselineFitCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var from = OperationOptions.Time("--from", "Start of the reference window (inclusive)", required: true);
        var to = OperationOptions.Time("--to", "End of the reference window (exclusive)", required: true);
        var keepAlerts = BaselineOutput.KeepAlertsOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("fit", "Fit a baseline on a reference window read from the model's data source; it becomes the active version") { key, from, to, keepAlerts, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline fit", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            DateTimeOffset start = parse.GetValue(from)!.Value;
            DateTimeOffset end = parse.GetValue(to)!.Value;
            var service = new BaselineService(databases, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            PreparedBaseline prepared = await service.PrepareFitAsync(parse.GetRequiredValue(key), start, end, ct);
            var activation = new BaselineActivation(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            ActivationOutcome outcome = await activation.StoreAsync(prepared, StoreCommandRunner.Actor, parse.GetValue(keepAlerts), ct);
            BaselineOutput.ReportStored(output, outcome, prepared.Reference);
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
