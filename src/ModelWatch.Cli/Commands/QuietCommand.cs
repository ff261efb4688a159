using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Cli.Operations;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch quiet KEY [--check NAME] (--for DURATION | --until T) --reason TEXT</c>, <c>quiet list [--all]</c>,
/// <c>quiet end ID</c>: hold a model's notifications during planned work. Runs and alerts go on; each notification a
/// quiet period holds is recorded as <c>held</c> and can be sent later with <c>alerts resend</c>.
/// </summary>
internal static class QuietCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "Model key" };
        var check = new Option<string?>("--check") { Description = "Only this check (default: every check of the model)" };
        var length = new Option<string?>("--for") { Description = "How long, e.g. 90m, 4h, 2d (an integer and s, m, h, d or w)" };
        var until = OperationOptions.Time("--until", "When it ends (RFC 3339, or now+N{s,m,h,d,w})", required: false);
        var reason = new Option<string>("--reason") { Description = "Why (kept with the quiet period and shown wherever it is)", Required = true };
        var actor = AlertsCommand.ActorOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("quiet", "Hold a model's notifications (or one check's) for a while; runs and alerts go on")
        {
            key, check, length, until, reason, actor, database,
        };
        command.Validators.Add(result =>
        {
            bool hasFor = result.GetResult(length) is { Tokens.Count: > 0 };
            bool hasUntil = result.GetResult(until) is { Tokens.Count: > 0 };
            if (hasFor == hasUntil)
            {
                result.AddError("give --for DURATION or --until TIME (one of them)");
            }
        });
        command.Subcommands.Add(List());
        command.Subcommands.Add(End());
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "quiet", database, async (databases, output, ct) =>
        {
            TextWriter error = parse.InvocationConfiguration.Error;
            DateTimeOffset now = TimeProvider.System.GetUtcNow();
            string model = parse.GetRequiredValue(key);
            string? checkName = parse.GetValue(check);
            await ModelKeys.RequireAsync(databases, model, ct);

            if (checkName is not null && CheckRegistry.Find(checkName) is null)
            {
                error.WriteLine($"modelwatch quiet: no check '{TerminalText.Clean(checkName)}'; the checks are {string.Join(", ", CheckRegistry.Names)}");
                return ExitCodes.RuntimeError;
            }

            DateTimeOffset end;
            if (parse.GetValue(length) is { } text)
            {
                if (!Duration.TryParse(text, out Duration duration, out string problem))
                {
                    error.WriteLine($"modelwatch quiet: --for: {problem}");
                    return ExitCodes.Usage;
                }

                if (duration.Length <= TimeSpan.Zero)
                {
                    error.WriteLine($"modelwatch quiet: --for: '{TerminalText.Clean(text)}' is not a positive duration");
                    return ExitCodes.Usage;
                }

                end = now + duration.Length;
            }
            else
            {
                end = parse.GetValue(until)!.Value;
                if (end <= now)
                {
                    error.WriteLine($"modelwatch quiet: --until: {CliJson.Time(end)} is not in the future");
                    return ExitCodes.Usage;
                }
            }

            string who = AlertsCommand.Actor(parse, actor);
            long id = await Repository(databases).CreateAsync(model, checkName, end, parse.GetRequiredValue(reason), who, now, ct);
            output.WriteLine(TerminalText.Clean(
                $"quiet period {id}: notifications for {model}{(checkName is null ? string.Empty : " / " + checkName)} are held until {CliJson.Time(end)} (set by {who}); runs and alerts go on. End it early with 'modelwatch quiet end {id}'."));
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command List()
    {
        var all = new Option<bool>("--all") { Description = "Also quiet periods that ended or expired" };
        var model = new Option<string?>("--model") { Description = "Only this model's quiet periods" };
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("list", "List the quiet periods in force (with --all, every one), newest first") { all, model, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "quiet list", database, async (databases, output, ct) =>
        {
            DateTimeOffset now = TimeProvider.System.GetUtcNow();
            if (parse.GetValue(model) is { } key)
            {
                await ModelKeys.RequireAsync(databases, key, ct);
            }

            IReadOnlyList<QuietPeriod> periods = await Repository(databases).ListAsync(parse.GetValue(all), parse.GetValue(model), now, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, periods, now));
                return ExitCodes.Ok;
            }

            if (periods.Count == 0)
            {
                output.WriteLine(parse.GetValue(all) ? "no quiet periods" : "no quiet period in force");
                return ExitCodes.Ok;
            }

            List<string[]> rows = [["ID", "MODEL", "CHECK", "STATE", "UNTIL", "HELD", "BY", "REASON"]];
            rows.AddRange(periods.Select(p => new[]
            {
                p.Id.ToString(CultureInfo.InvariantCulture),
                p.Model,
                p.Check ?? "(all)",
                p.StateAt(now),
                CliJson.Time(p.EndedAt ?? p.Until)!,
                p.Held.ToString(CultureInfo.InvariantCulture),
                p.EndedBy is null ? p.CreatedBy : $"{p.CreatedBy}, ended by {p.EndedBy}",
                p.Reason,
            }));
            CliJson.WriteTable(output, rows);
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static Command End()
    {
        var id = new Argument<long>("id") { Description = "Quiet period number (see 'modelwatch quiet list')" };
        var actor = AlertsCommand.ActorOption();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("end", "End a quiet period now; notifications from then on are sent") { id, actor, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "quiet end", database, async (databases, output, ct) =>
        {
            AlertChange change = await Repository(databases).EndAsync(parse.GetValue(id), AlertsCommand.Actor(parse, actor), TimeProvider.System.GetUtcNow(), ct);
            if (change.Kind == AlertChangeKind.NotFound)
            {
                parse.InvocationConfiguration.Error.WriteLine("modelwatch quiet end: " + change.Message);
                return ExitCodes.RuntimeError;
            }

            output.WriteLine(TerminalText.Clean(change.Message));
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void WriteJson(Utf8JsonWriter writer, IReadOnlyList<QuietPeriod> periods, DateTimeOffset now)
    {
        writer.WriteStartObject();
        writer.WriteStartArray("quiet_periods");
        foreach (QuietPeriod period in periods)
        {
            writer.WriteStartObject();
            writer.WriteNumber("id", period.Id);
            writer.WriteString("model", period.Model);
            writer.WriteString("check", period.Check);
            writer.WriteString("state", period.StateAt(now));
            CliJson.WriteTime(writer, "until", period.Until);
            writer.WriteString("reason", period.Reason);
            writer.WriteString("created_by", period.CreatedBy);
            CliJson.WriteTime(writer, "created_at", period.CreatedAt);
            CliJson.WriteTime(writer, "ended_at", period.EndedAt);
            writer.WriteString("ended_by", period.EndedBy);
            writer.WriteNumber("held_notifications", period.Held);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteEndObject();
    }

    private static QuietPeriodRepository Repository(ModelWatch.Store.Configuration.StoreDataSources databases) =>
        new(databases.State, StoreCommandRunner.CommandTimeout);
}
