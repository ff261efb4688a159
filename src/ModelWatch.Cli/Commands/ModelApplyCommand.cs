using System.CommandLine;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch model apply FILE|DIR [--prune]</c>: validates every spec first and writes nothing unless all are
/// valid; then upserts them in one transaction. <c>--prune</c> disables registered models that have no file.
/// </summary>
internal static class ModelApplyCommand
{
    public static Command Create()
    {
        var path = new Argument<string>("path") { Description = "A model spec (.yaml) or a folder of them (one model per file)" };
        var prune = new Option<bool>("--prune") { Description = "Disable registered models whose spec is not among the files (their history is kept)" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("apply", "Validate model specs and register them (all or nothing)") { path, prune, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "model apply", database, async (databases, output, ct) =>
        {
            string target = parse.GetRequiredValue(path);
            if (parse.GetValue(prune) && !Directory.Exists(target))
            {
                // Pruning against one file would disable every other model.
                throw new FormatException($"--prune needs a folder of specs, and '{target}' is not a folder");
            }

            IReadOnlyList<(ModelSpec Spec, string File)> specs = ModelSpecFiles.Load(target);
            var repository = new ModelRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            IReadOnlyList<ApplyOutcome> outcomes = await repository.ApplyAsync([.. specs.Select(s => (s.Spec, (string?)s.File))], parse.GetValue(prune), ct);
            foreach (ApplyOutcome outcome in outcomes)
            {
                string action = outcome.Action.ToString().ToLowerInvariant();
                output.WriteLine(outcome.BaselineNote is null ? $"{outcome.Key}: {action}" : $"{outcome.Key}: {action} ({outcome.BaselineNote})");
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
