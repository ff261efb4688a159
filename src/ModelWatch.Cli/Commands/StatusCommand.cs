using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Fleet;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch status [--format table|json] [--fail-on warning|critical]</c>: the fleet at a glance, one row per model:
/// its newest run, open alerts by severity, quiet periods in force, the baseline it is watched against and its age,
/// and how many runs in a row have failed.
/// </summary>
internal static class StatusCommand
{
    public static Command Create()
    {
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var failOn = new Option<string?>("--fail-on") { Description = "Exit with code 1 when any model has an unresolved alert at this severity or above: warning or critical" };
        failOn.AcceptOnlyFromAmong("warning", "critical");
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("status", "The fleet at a glance: each model's last run, open alerts, quiet periods, baseline and failing runs") { format, failOn, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "status", database, async (databases, output, ct) =>
        {
            DateTimeOffset now = TimeProvider.System.GetUtcNow();
            IReadOnlyList<ModelStatus> models = await new FleetStatusReader(databases.State, StoreCommandRunner.CommandTimeout).ReadAsync(now, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, models, now));
            }
            else
            {
                WriteTable(output, models, now);
            }

            return parse.GetValue(failOn) is { } level && models.Any(m => m.HasOpenAlertAtLeast(level)) ? ExitCodes.Findings : ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void WriteTable(TextWriter output, IReadOnlyList<ModelStatus> models, DateTimeOffset now)
    {
        if (models.Count == 0)
        {
            output.WriteLine("no models registered; add one with 'modelwatch model apply SPEC'");
            return;
        }

        List<string[]> rows = [["MODEL", "ENABLED", "LAST RUN", "STATUS", "WORST", "OPEN ALERTS", "QUIET UNTIL", "BASELINE", "FAILING"]];
        rows.AddRange(models.Select(m => new[]
        {
            m.Key,
            m.Enabled ? "yes" : "no",
            CliJson.Time(m.LastRunAt) ?? "never",
            m.LastStatus ?? "-",
            m.WorstSeverity ?? "-",
            OpenAlerts(m),
            m.QuietUntil is null ? "-" : CliJson.Time(m.QuietUntil)!,
            m.BaselineVersion is { } v ? string.Create(CultureInfo.InvariantCulture, $"v{v}, {m.BaselineAgeDays(now)} d") : "none",
            m.FailingRuns == 0 ? "0" : m.FailingRuns.ToString(CultureInfo.InvariantCulture) + " in a row",
        }));
        CliJson.WriteTable(output, rows);
    }

    private static string OpenAlerts(ModelStatus model) => (model.OpenCritical, model.OpenWarning) switch
    {
        (0, 0) => "none",
        (var c, 0) => string.Create(CultureInfo.InvariantCulture, $"{c} critical"),
        (0, var w) => string.Create(CultureInfo.InvariantCulture, $"{w} warning"),
        (var c, var w) => string.Create(CultureInfo.InvariantCulture, $"{c} critical, {w} warning"),
    };

    private static void WriteJson(Utf8JsonWriter writer, IReadOnlyList<ModelStatus> models, DateTimeOffset now)
    {
        writer.WriteStartObject();
        writer.WriteStartArray("models");
        foreach (ModelStatus model in models)
        {
            writer.WriteStartObject();
            writer.WriteString("key", model.Key);
            writer.WriteBoolean("enabled", model.Enabled);
            CliJson.WriteTime(writer, "last_run_at", model.LastRunAt);
            writer.WriteString("last_status", model.LastStatus);
            writer.WriteString("worst_severity", model.WorstSeverity);
            writer.WriteStartObject("open_alerts");
            writer.WriteNumber("warning", model.OpenWarning);
            writer.WriteNumber("critical", model.OpenCritical);
            writer.WriteEndObject();
            CliJson.WriteTime(writer, "quiet_until", model.QuietUntil);
            JsonNumbers.Write(writer, "baseline_version", model.BaselineVersion);
            JsonNumbers.Write(writer, "baseline_age_days", model.BaselineAgeDays(now));
            writer.WriteNumber("failing_runs", model.FailingRuns);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteEndObject();
    }
}
