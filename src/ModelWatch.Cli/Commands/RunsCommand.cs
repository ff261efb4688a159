using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Persistence;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch runs list [KEY] [--limit N] [--format table|json]</c> and <c>modelwatch runs show ID [--format table|json]</c>.</summary>
internal static class RunsCommand
{
    public static Command Create()
    {
        var key = new Argument<string?>("key") { Description = "Only this model's runs", Arity = ArgumentArity.ZeroOrOne };
        var limit = new Option<int>("--limit") { Description = "Newest runs to show", DefaultValueFactory = _ => 50 };
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var database = StoreCommandRunner.DatabaseOption();
        var list = new Command("list", "List recorded runs, newest first: slot, window, status, worker and stage timings") { key, limit, format, database };
        list.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "runs list", database, async (databases, output, ct) =>
        {
            if (parse.GetValue(key) is { } model)
            {
                await ModelKeys.RequireAsync(databases, model, ct);
            }

            IReadOnlyList<RunView> runs = await new RunQueries(databases.State, StoreCommandRunner.CommandTimeout).ListAsync(parse.GetValue(key), Math.Max(1, parse.GetValue(limit)), ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, runs));
                return ExitCodes.Ok;
            }

            // The window a run read follows from its slot and the spec; it is in --format json and 'explain ID'.
            List<string[]> rows = [["ID", "MODEL", "SLOT", "STATUS", "ROWS", "WORKER", "SECONDS", "REASON"]];
            rows.AddRange(runs.Select(r => new[]
            {
                r.Id.ToString(CultureInfo.InvariantCulture), r.Model, CliJson.Time(r.Slot)!,
                r.Status, r.RowsRead.ToString(CultureInfo.InvariantCulture), r.Worker,
                r.FinishedAt is { } f ? (f - r.StartedAt).TotalSeconds.ToString("F2", CultureInfo.InvariantCulture) : "-",
                r.Reason ?? string.Empty,
            }));
            CliJson.WriteTable(output, rows, freeText: "REASON");
            return ExitCodes.Ok;
        }, cancellationToken));
        return new Command("runs", "Run history") { list, Show() };
    }

    private static Command Show()
    {
        var id = new Argument<long>("id") { Description = "The run's id (from runs list)" };
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var database = StoreCommandRunner.DatabaseOption();
        var show = new Command("show", "One recorded run and every finding it recorded: statistic, value, p-value, alpha and limit") { id, format, database };
        show.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "runs show", database, async (databases, output, ct) =>
        {
            var queries = new RunQueries(databases.State, StoreCommandRunner.CommandTimeout);
            if (await queries.GetAsync(parse.GetValue(id), ct) is not { } run)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch runs show: run {parse.GetValue(id)} does not exist");
                return ExitCodes.RuntimeError;
            }

            IReadOnlyList<FindingView> findings = await queries.FindingsAsync(run.Id, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, run, findings));
                return ExitCodes.Ok;
            }

            output.WriteLine($"run {run.Id}, model {run.Model}, slot {CliJson.Time(run.Slot)}, status {run.Status}{(run.Reason is null ? string.Empty : " (" + TerminalText.Clean(run.Reason) + ")")}");
            List<string[]> rows = [["CHECK", "SUBJECT", "SEVERITY", "STATISTIC", "VALUE", "P", "ALPHA", "LIMIT", "EXPLANATION"]];
            rows.AddRange(findings.Select(f => new[]
            {
                f.Check, f.Subject ?? "-", f.SkipReason is null ? f.Severity : "skipped", f.Statistic, Number(f.Value), Number(f.PValue), Number(f.Alpha), Number(f.Limit), f.Explanation,
            }));
            CliJson.WriteTable(output, rows);
            return ExitCodes.Ok;
        }, cancellationToken));
        return show;
    }

    private static string Number(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("G4", CultureInfo.InvariantCulture) : "-";

    private static void WriteJson(Utf8JsonWriter writer, IReadOnlyList<RunView> runs)
    {
        writer.WriteStartArray();
        foreach (RunView run in runs)
        {
            writer.WriteStartObject();
            WriteFields(writer, run);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
    }

    private static void WriteJson(Utf8JsonWriter writer, RunView run, IReadOnlyList<FindingView> findings)
    {
        writer.WriteStartObject();
        WriteFields(writer, run);
        writer.WriteStartArray("findings");
        foreach (FindingView f in findings)
        {
            writer.WriteStartObject();
            writer.WriteString("check", f.Check);
            writer.WriteString("subject", f.Subject);
            writer.WriteString("severity", f.SkipReason is null ? f.Severity : "skipped");
            writer.WriteString("skip_reason", f.SkipReason);
            writer.WriteString("statistic", f.Statistic);
            JsonNumbers.WriteTest(writer, f.Value, f.Threshold, f.PValue, f.Alpha, f.Limit);
            JsonNumbers.Write(writer, "effect_size", f.EffectSize);
            writer.WriteString("explanation", f.Explanation);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteEndObject();
    }

    private static void WriteFields(Utf8JsonWriter writer, RunView run)
    {
        writer.WriteNumber("id", run.Id);
        writer.WriteString("model", run.Model);
        CliJson.WriteTime(writer, "slot", run.Slot);
        writer.WriteStartObject("window");
        CliJson.WriteTime(writer, "start", run.WindowStart);
        CliJson.WriteTime(writer, "end", run.WindowEnd);
        writer.WriteEndObject();
        writer.WriteString("status", run.Status);
        writer.WriteString("reason", run.Reason);
        if (run.BaselineVersion is { } version)
        {
            writer.WriteNumber("baseline_version", version);
        }
        else
        {
            writer.WriteNull("baseline_version");
        }

        writer.WriteNumber("rows_read", run.RowsRead);
        writer.WriteNumber("rows_rejected", run.RowsRejected);
        writer.WriteString("worker", run.Worker);
        CliJson.WriteTime(writer, "started_at", run.StartedAt);
        CliJson.WriteTime(writer, "finished_at", run.FinishedAt);
        writer.WritePropertyName("timings");
        using (JsonDocument timings = JsonDocument.Parse(run.StageTimings))
        {
            timings.RootElement.WriteTo(writer);
        }
    }
}
