using System.CommandLine;
using System.Globalization;
using ModelWatch.Checks.Summaries;
using ModelWatch.Cli.Operations;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch baseline fit KEY --from T --to T</c> and <c>modelwatch baseline import KEY FILE.json [--from T --to T]</c>.</summary>
internal static class BaselineCommand
{
    public static Command Create()
    {
        var command = new Command("baseline", "Store a model's deployed coefficients and reference statistics (each change is a new version)");
        command.Subcommands.Add(CreateFit());
        command.Subcommands.Add(CreateImport());
        return command;
    }

    private static Command CreateFit()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var from = OperationOptions.Time("--from", "Start of the reference window (inclusive)", required: true);
        var to = OperationOptions.Time("--to", "End of the reference window (exclusive)", required: true);
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("fit", "Fit a baseline on a reference window read from the model's data source") { key, from, to, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline fit", database, async (databases, output, ct) =>
        {
            DateTimeOffset start = parse.GetValue(from)!.Value;
            DateTimeOffset end = parse.GetValue(to)!.Value;
            var service = new BaselineService(databases, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            Report(output, await service.FitAsync(parse.GetRequiredValue(key), start, end, StoreCommandRunner.Actor, ct));
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command CreateImport()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var file = new Argument<FileInfo>("file") { Description = "Coefficients as JSON: our import format, or what 'modelwatch fit --format json' prints" };
        var from = OperationOptions.Time("--from", "Start of a reference window that completes the reference statistics", required: false);
        var to = OperationOptions.Time("--to", "End of that reference window (exclusive)", required: false);
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("import", "Import deployed coefficients from a training pipeline") { key, file, from, to, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline import", database, async (databases, output, ct) =>
        {
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
            Report(output, await service.ImportAsync(parse.GetRequiredValue(key), input.Name, json, window, StoreCommandRunner.Actor, ct));
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void Report(TextWriter output, StoredBaseline stored)
    {
        BaselineReference reference = stored.Reference;
        string origin = reference.Origin == BaselineOrigin.Fitted ? "fitted" : "imported";
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"{stored.ModelKey}: baseline version {stored.Version} ({origin}, n = {reference.RowCount}, residual SD = {reference.ResidualStandardDeviation:G6}, {reference.SampleSize} reference row(s) sampled)"));
        foreach ((string term, double value) in reference.Coefficients)
        {
            output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"  {term,-24} {value,14:G8}"));
        }
    }
}
