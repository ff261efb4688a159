using System.CommandLine;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Evidence;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch explain ALERT_ID [--html FILE]</c> and <c>modelwatch explain --run RUN_ID [--html FILE]</c>: the evidence
/// behind an alert or a run in the terminal and, with <c>--html</c>, as a self-contained report with charts (the page
/// the daemon serves at <c>/alerts/{id}</c>). Alerts and runs are numbered separately, so a bare id is an alert id.
/// </summary>
internal static class ExplainCommand
{
    public static Command Create()
    {
        var id = new Argument<long?>("alert-id") { Description = "The alert's id (as 'modelwatch alerts' lists it)", Arity = ArgumentArity.ZeroOrOne };
        var run = new Option<long?>("--run") { Description = "Explain this run instead of an alert (run ids are numbered apart from alert ids)", HelpName = "RUN_ID" };
        var html = new Option<string?>("--html") { Description = "Also write a self-contained HTML report with charts to this file", HelpName = "FILE" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("explain", "Show the evidence behind an alert (or, with --run, a run): what moved, the error decomposition, the features involved, the runbook") { id, run, html, database };
        command.Validators.Add(result =>
        {
            // Count the tokens rather than read the values: a value that does not parse already has its own error.
            bool hasAlert = result.GetResult(id) is { Tokens.Count: > 0 }, hasRun = result.GetResult(run) is { Tokens.Count: > 0 };
            if (hasAlert == hasRun)
            {
                result.AddError(hasAlert ? "give an alert id or --run RUN_ID, not both" : "give an alert id, or --run RUN_ID for a run");
            }
        });
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "explain", database, async (databases, output, ct) =>
        {
            string? file = parse.GetValue(html);
            var loader = new EvidenceLoader(databases, StoreCommandRunner.CommandTimeout);
            (Evidence? evidence, string missing) = parse.GetValue(run) is { } runId
                ? (await loader.LoadRunAsync(runId, readWindow: file is not null, ct), $"no run has id {runId}")
                : (await loader.LoadAlertAsync(parse.GetValue(id)!.Value, readWindow: file is not null, ct), $"no alert has id {parse.GetValue(id)} (for a run, use --run RUN_ID)");
            if (evidence is null)
            {
                parse.InvocationConfiguration.Error.WriteLine("modelwatch explain: " + missing);
                return ExitCodes.RuntimeError;
            }

            EvidenceText.Write(output, evidence);
            if (file is not null)
            {
                output.WriteLine();
                output.WriteLine("report: " + await EvidenceReport.WriteAsync(evidence, file, TimeProvider.System, ct));
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
