using System.CommandLine;
using ModelWatch.Checks.Summaries;
using ModelWatch.Cli.Operations;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch baseline import KEY FILE.json [--from T --to T] [--keep-alerts]</c>.</summary>
internal static class BaselineImportCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var file = new Argument<FileInfo>("file") { Description = "Coefficients as JSON: our import format, or what 'modelwatch fit --format json' prints" };
        var from = OperationOptions.Time("--from", "Start of a reference window that completes the reference statistics", required: false);
        var to = OperationOptions.Time("--to", "End of that reference window (exclusive)", required: false);
        var keepAlerts = BaselineOutput.KeepAlertsOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("import", "Import deployed coefficients from a training pipeline; they become the active version") { key, file, from, to, keepAlerts, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline import", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            FileInfo input = parse.GetRequiredValue(file);
            DateTimeOffset? start = parse.GetValue(from);
            DateTimeOffset? end = parse.GetValue(to);
            if ((start is null) != (end is null))
            {
                throw new FormatException("give both --from and --to for a reference window, or neither");
            }

            (DateTimeOffset, DateTimeOffset)? window = start is null ? null : (start.Value, end!.Value);
            string json = await File.ReadAllTextAsync(input.FullName, ct);
            var service = new BaselineService(databases, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            PreparedBaseline prepared = await service.PrepareImportAsync(parse.GetRequiredValue(key), input.Name, json, window, ct);
            var activation = new BaselineActivation(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            ActivationOutcome outcome = await activation.StoreAsync(prepared, StoreCommandRunner.Actor, parse.GetValue(keepAlerts), ct);
            BaselineOutput.ReportStored(output, outcome, prepared.Reference);
            WarnDisabled(parse.InvocationConfiguration.Error, outcome, prepared.Reference);
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    /// <summary>Names the tests that will be skipped for want of reference rows: stored, but watched less than it seems.</summary>
    private static void WarnDisabled(TextWriter error, ActivationOutcome outcome, BaselineReference reference)
    {
        List<BaselineCapability> missing = [.. BaselineCapabilities.Of(reference).Where(c => c.FromReferenceRows && !c.Available)];
        if (missing.Count > 0)
        {
            error.WriteLine(
                $"modelwatch baseline import: warning: model {outcome.ModelKey} baseline version {outcome.Version} has no reference sample, so these tests will be skipped "
                + "on every run (import again with --from/--to over rows the coefficients describe to enable them):");
            foreach (BaselineCapability capability in missing)
            {
                error.WriteLine($"  {capability.Tests} (needs {capability.Needs})");
            }
        }

        foreach (BaselineCapability capability in BaselineCapabilities.Of(reference).Where(c => !c.FromReferenceRows && !c.Available))
        {
            error.WriteLine($"modelwatch baseline import: warning: model {outcome.ModelKey}: the file carries no {capability.Needs}, so these tests will be skipped: {capability.Tests}");
        }
    }
}
