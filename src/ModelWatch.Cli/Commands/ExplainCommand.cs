using System.CommandLine;
using ModelWatch.Cli.Reports;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch explain ID [--html FILE]</c>: the evidence behind an alert or a run (ids come from one sequence, so
/// an id names one of them) in the terminal and, with <c>--html</c>, as a self-contained report with charts.
/// </summary>
internal static class ExplainCommand
{
    public static Command Create()
    {
        var id = new Argument<long>("id") { Description = "An alert id or a run id" };
        var html = new Option<string?>("--html") { Description = "Also write a self-contained HTML report with charts to this file" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("explain", "Show the evidence behind an alert or a run: what moved, the error decomposition, the features involved, the runbook") { id, html, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "explain", database, async (databases, output, ct) =>
        {
            long value = parse.GetValue(id);
            string? file = parse.GetValue(html);
            Evidence? evidence = await new EvidenceLoader(databases, StoreCommandRunner.CommandTimeout).LoadAsync(value, readWindow: file is not null, ct);
            if (evidence is null)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch explain: no alert or run has id {value}");
                return ExitCodes.RuntimeError;
            }

            EvidenceText.Write(output, evidence);
            if (file is not null)
            {
                output.WriteLine();
                output.WriteLine("report: " + await EvidenceReport.WriteAsync(evidence, file, ct));
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
