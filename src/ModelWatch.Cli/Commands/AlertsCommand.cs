using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Cli.Operations;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch alerts list|show|ack|resolve|resend</c>: triage from the command line. Changes record the actor
/// (<c>--actor</c>, default the current user as <c>person:user@host</c>) and an optional <c>--note</c>; acknowledging or
/// resolving twice changes nothing and says who did it first. Notifications are held with <c>modelwatch quiet</c>.
/// </summary>
internal static class AlertsCommand
{
    public static Command Create() => new("alerts", "Alert triage: list, show, acknowledge, resolve, resend notifications")
    {
        List(), Show(), Change("ack", "Acknowledge an open alert"), Change("resolve", "Resolve an open or acknowledged alert"), Resend(),
    };

    private static Command List()
    {
        var key = new Argument<string?>("key") { Description = "Only this model's alerts", Arity = ArgumentArity.ZeroOrOne };
        var state = new Option<string>("--state") { Description = "unresolved, open, acknowledged, resolved or all", DefaultValueFactory = _ => "unresolved" };
        state.AcceptOnlyFromAmong("unresolved", "open", "acknowledged", "resolved", "all");
        var limit = new Option<int>("--limit") { Description = "Newest alerts to show", DefaultValueFactory = _ => 100 };
        var format = FormatOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("list", "List alerts, newest first") { key, state, limit, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "alerts list", database, async (databases, output, ct) =>
        {
            if (parse.GetValue(key) is { } model)
            {
                await ModelKeys.RequireAsync(databases, model, ct);
            }

            string? filter = parse.GetValue(state) is "all" ? null : parse.GetValue(state);
            IReadOnlyList<AlertView> alerts = await Repository(databases).ListAsync(parse.GetValue(key), filter, Math.Max(1, parse.GetValue(limit)), ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer =>
                {
                    writer.WriteStartArray();
                    foreach (AlertView alert in alerts)
                    {
                        WriteAlert(writer, alert, null);
                    }

                    writer.WriteEndArray();
                });
                return ExitCodes.Ok;
            }

            if (alerts.Count == 0)
            {
                output.WriteLine(parse.GetValue(state) is "all" ? "no alerts" : $"no {parse.GetValue(state)} alerts");
                return ExitCodes.Ok;
            }

            List<string[]> rows = [["ALERT", "MODEL", "CHECK", "SUBJECT", "STATE", "OPENED", "OPENED AS", "QUIET UNTIL", "LATEST EVIDENCE"]];
            rows.AddRange(alerts.Select(a => new[]
            {
                "#" + a.Id.ToString(CultureInfo.InvariantCulture),
                a.Model,
                a.Check,
                a.Subject ?? "-",
                a.State,
                CliJson.Time(a.OpenedAt)!,
                OpeningInBrief(a),
                a.QuietUntil is null ? "-" : CliJson.Time(a.QuietUntil)!,
                Latest(a),
            }));
            CliJson.WriteTable(output, rows, freeText: "LATEST EVIDENCE");
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command Show()
    {
        var id = new Argument<long>("id") { Description = "Alert id" };
        var format = FormatOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("show", "Show one alert and its history") { id, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "alerts show", database, async (databases, output, ct) =>
        {
            AlertRepository repository = Repository(databases);
            AlertView? alert = await repository.GetAsync(parse.GetValue(id), ct);
            if (alert is null)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch alerts show: no alert #{parse.GetValue(id)}");
                return ExitCodes.RuntimeError;
            }

            IReadOnlyList<AlertHistoryEntry> history = await repository.HistoryAsync(alert.Id, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteAlert(writer, alert, history));
                return ExitCodes.Ok;
            }

            output.WriteLine(TerminalText.Clean($"alert #{alert.Id}: {alert.Model} / {alert.Check}{(alert.Subject is null ? string.Empty : " / " + alert.Subject)} — {alert.State}{Again(alert)}"));
            output.WriteLine(TerminalText.Clean($"  opened as:       {Opening(alert)}"));
            output.WriteLine(TerminalText.Clean($"  latest evidence: {Latest(alert)}"));
            if (alert.QuietUntil is not null)
            {
                output.WriteLine($"  notifications held by a quiet period until {CliJson.Time(alert.QuietUntil)}");
            }
            if (alert.Note is not null)
            {
                output.WriteLine("  note: " + TerminalText.Clean(alert.Note));
            }

            foreach (AlertHistoryEntry entry in history)
            {
                output.WriteLine(TerminalText.Clean($"  {CliJson.Time(entry.At)}  {entry.Transition,-12} {(entry.Transition is "opened" or "escalated" ? entry.Severity : string.Empty),-8} by {entry.Actor}{(entry.RunId is { } run ? $" (run {run})" : string.Empty)}: {entry.Explanation}"));
                foreach (NotificationStatus notification in entry.Notifications)
                {
                    string attempts = notification.Attempts == 1 ? "1 attempt" : $"{notification.Attempts} attempts";
                    output.WriteLine(TerminalText.Clean($"      → {notification.Target}: {notification.State}{(notification.Detail is null ? string.Empty : " (" + notification.Detail + ")")}, {attempts}"));
                }
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command Change(string verb, string description)
    {
        var id = new Argument<long>("id") { Description = "Alert id" };
        var actor = ActorOption();
        var note = new Option<string?>("--note") { Description = "A note kept with the alert" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command(verb, description) { id, actor, note, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "alerts " + verb, database, async (databases, output, ct) =>
        {
            AlertRepository repository = Repository(databases);
            long alertId = parse.GetValue(id);
            string who = Actor(parse, actor);
            AlertChange change = verb == "ack"
                ? await repository.AcknowledgeAsync(alertId, who, parse.GetValue(note), TimeProvider.System.GetUtcNow(), ct)
                : await repository.ResolveAsync(alertId, who, parse.GetValue(note), TimeProvider.System.GetUtcNow(), ct);
            if (change.Kind == AlertChangeKind.NotFound)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch alerts {verb}: {change.Message}");
                return ExitCodes.RuntimeError;
            }

            output.WriteLine(TerminalText.Clean(change.Message));
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command Resend()
    {
        var id = new Argument<long?>("id") { Description = "Alert id (or --since for every alert)", Arity = ArgumentArity.ZeroOrOne };
        var since = OperationOptions.Time("--since", "Notifications queued since this time, of any alert", required: false);
        var target = new Option<string?>("--target") { Description = "Only this notification target" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("resend", "Queue failed or skipped notifications again (after a target's outage or a configuration fix)") { id, since, target, database };
        command.Validators.Add(result =>
        {
            bool hasId = result.GetResult(id) is { Tokens.Count: > 0 };
            bool hasSince = result.GetResult(since) is { Tokens.Count: > 0 };
            if (hasId == hasSince)
            {
                result.AddError("give an alert id or --since, not both and not neither");
            }
        });
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "alerts resend", database, async (databases, output, ct) =>
        {
            AlertRepository repository = Repository(databases);
            long? alertId = parse.GetValue(id);
            if (alertId is { } one && await repository.GetAsync(one, ct) is null)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch alerts resend: no alert #{one}");
                return ExitCodes.RuntimeError;
            }

            DateTimeOffset? from = parse.GetValue(since);
            int queued = await repository.ResendAsync(alertId, from, parse.GetValue(target), ct);
            output.WriteLine($"{queued} notification(s) queued again; a running daemon sends them within Notifications:PollInterval");
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    /// <summary>The <c>--actor</c> option of commands that change state: who is acting, default the current user.</summary>
    internal static Option<string?> ActorOption() => new("--actor") { Description = "Who is acting, recorded as person:NAME (default: the current user, person:user@host)" };

    /// <summary>The actor a command records: <c>--actor NAME</c> as <c>person:NAME</c>, else the current user.</summary>
    internal static string Actor(ParseResult parse, Option<string?> actor) =>
        parse.GetValue(actor) is { Length: > 0 } name ? Actors.Person(name) : Actors.CurrentPerson;

    private static string Again(AlertView alert) =>
        alert.PreviousAlertId is { } previous ? $" (again, after #{previous.ToString(CultureInfo.InvariantCulture)})" : string.Empty;

    private static string Opening(AlertView alert) =>
        $"{alert.OpeningSeverity}{Again(alert)}: {alert.OpeningExplanation}";

    // The list keeps the opening evidence to its severity and statistic, so the latest evidence has the room to be read;
    // `alerts show` and JSON give both explanations whole.
    private static string OpeningInBrief(AlertView alert)
    {
        string statistic = alert.OpeningStatistic is { } name
            ? " " + name + (alert.OpeningValue is { } v ? " " + v.ToString("G4", CultureInfo.InvariantCulture) : string.Empty)
            : string.Empty;
        return $"{alert.OpeningSeverity}{statistic}{(alert.PreviousAlertId is { } previous ? $", again after #{previous.ToString(CultureInfo.InvariantCulture)}" : string.Empty)}";
    }

    private static string Latest(AlertView alert) =>
        alert.Explanation is null ? "-" : $"{alert.LatestSeverity ?? "recorded"}: {alert.Explanation}";

    private static Option<OutputFormat> FormatOption() => new("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };

    private static AlertRepository Repository(ModelWatch.Store.Configuration.StoreDataSources databases) =>
        new(databases.State, StoreCommandRunner.CommandTimeout);

    private static void WriteAlert(Utf8JsonWriter writer, AlertView alert, IReadOnlyList<AlertHistoryEntry>? history)
    {
        writer.WriteStartObject();
        writer.WriteNumber("id", alert.Id);
        writer.WriteString("model", alert.Model);
        writer.WriteString("check", alert.Check);
        writer.WriteString("subject", alert.Subject);
        writer.WriteString("severity", alert.Severity);
        writer.WriteString("state", alert.State);
        CliJson.WriteTime(writer, "opened_at", alert.OpenedAt);
        writer.WriteString("opened_by", alert.OpenedBy);
        CliJson.WriteTime(writer, "acknowledged_at", alert.AcknowledgedAt);
        writer.WriteString("acknowledged_by", alert.AcknowledgedBy);
        CliJson.WriteTime(writer, "resolved_at", alert.ResolvedAt);
        writer.WriteString("resolved_by", alert.ResolvedBy);
        JsonNumbers.Write(writer, "first_run_id", alert.FirstRunId);
        JsonNumbers.Write(writer, "last_run_id", alert.LastRunId);
        writer.WriteString("note", alert.Note);
        JsonNumbers.Write(writer, "previous_alert", alert.PreviousAlertId);
        JsonNumbers.Write(writer, "baseline_version", alert.BaselineVersion);
        CliJson.WriteTime(writer, "quiet_until", alert.QuietUntil);
        writer.WriteStartObject("opening");
        writer.WriteString("severity", alert.OpeningSeverity);
        writer.WriteString("statistic", alert.OpeningStatistic);
        JsonNumbers.WriteTest(writer, alert.OpeningValue, alert.OpeningThreshold, alert.OpeningPValue, alert.OpeningAlpha, alert.OpeningLimit);
        writer.WriteString("explanation", alert.OpeningExplanation);
        writer.WriteEndObject();
        writer.WriteStartObject("latest");
        writer.WriteString("severity", alert.LatestSeverity);
        writer.WriteString("statistic", alert.Statistic);
        JsonNumbers.WriteTest(writer, alert.Value, alert.Threshold, alert.PValue, alert.Alpha, alert.Limit);
        writer.WriteString("explanation", alert.Explanation);
        writer.WriteEndObject();

        // Kept for scripts written against earlier releases: the latest evidence, flat.
        writer.WriteString("statistic", alert.Statistic);
        JsonNumbers.Write(writer, "value", alert.Value);
        JsonNumbers.Write(writer, "threshold", alert.Threshold);
        writer.WriteString("explanation", alert.Explanation);
        if (history is not null)
        {
            writer.WriteStartArray("history");
            foreach (AlertHistoryEntry entry in history)
            {
                writer.WriteStartObject();
                writer.WriteString("transition", entry.Transition);
                writer.WriteString("severity", entry.Severity);
                writer.WriteString("state", entry.State);
                JsonNumbers.Write(writer, "run_id", entry.RunId);
                writer.WriteString("actor", entry.Actor);
                CliJson.WriteTime(writer, "at", entry.At);
                writer.WriteString("statistic", entry.Statistic);
                JsonNumbers.WriteTest(writer, entry.Value, entry.Threshold, entry.PValue, entry.Alpha, entry.Limit);
                writer.WriteString("explanation", entry.Explanation);
                writer.WriteStartArray("notifications");
                foreach (NotificationStatus notification in entry.Notifications)
                {
                    writer.WriteStartObject();
                    writer.WriteString("target", notification.Target);
                    writer.WriteString("state", notification.State);
                    writer.WriteString("detail", notification.Detail);
                    writer.WriteNumber("attempts", notification.Attempts);
                    CliJson.WriteTime(writer, "finished_at", notification.FinishedAt);
                    writer.WriteEndObject();
                }

                writer.WriteEndArray();
                writer.WriteEndObject();
            }

            writer.WriteEndArray();
        }

        writer.WriteEndObject();
    }
}
