using System.Globalization;
using System.Text.Json;
using ModelWatch.Cli.Output;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Operations;

/// <summary>Prints a backtest: exactly the documented JSON fields, or the windows and the alert timeline for people.</summary>
internal static class BacktestOutput
{
    public static void WriteJson(Utf8JsonWriter writer, string model, IReadOnlyList<BacktestWindow> windows, IReadOnlyList<TimelineAlert> alerts)
    {
        writer.WriteStartObject();
        writer.WriteString("model", model);
        writer.WriteStartArray("windows");
        foreach (BacktestWindow window in windows)
        {
            writer.WriteStartObject();
            writer.WriteString("start", CliJson.Time(window.Start));
            writer.WriteString("end", CliJson.Time(window.End));
            writer.WriteString("status", window.Status);
            FindingLine.WriteArray(writer, window.Findings);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteStartArray("alerts");
        foreach (TimelineAlert alert in alerts)
        {
            writer.WriteStartObject();
            writer.WriteString("check", alert.Check);
            writer.WriteString("subject", alert.Subject);
            writer.WriteString("severity", FindingLine.NameOf(alert.Severity));
            writer.WriteString("opened_at", CliJson.Time(alert.OpenedAt));
            writer.WriteString("resolved_at", CliJson.Time(alert.ResolvedAt));
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        writer.WriteEndObject();
    }

    public static void WriteTable(TextWriter output, ModelRecord model, Duration? every, IReadOnlyList<BacktestWindow> windows, IReadOnlyList<TimelineAlert> alerts)
    {
        int failed = windows.Count(w => w.Status == "failed");
        int skipped = windows.Count(w => w.Status == "skipped");
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"backtest of {model.Key}: {windows.Count} window(s), slots {CliJson.Time(windows[0].Slot)} to {CliJson.Time(windows[^1].Slot)} every {every?.ToString() ?? model.Spec.Schedule.Text}; {skipped} skipped, {failed} failed; nothing was written"));
        // Every window follows from its slot, so the table names the rule once instead of two times per row.
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"each slot reads the {model.Spec.Window} window that ends {(model.Spec.LabelDelay.Length == TimeSpan.Zero ? "at the slot" : $"{model.Spec.LabelDelay} before it")} (each window's times: --format json)"));
        output.WriteLine();
        List<string[]> rows = [["SLOT", "STATUS", "WORST", "WARN", "CRIT", "WORST FINDING"]];
        rows.AddRange(windows.Select(w =>
        {
            FindingLine? top = w.Findings.Count > 0 ? w.Findings[0] : null;
            return new[]
            {
                CliJson.Time(w.Slot)!,
                w.Status,
                top is null ? "-" : top.SeverityName,
                Count(w, Checks.Findings.Severity.Warning),
                Count(w, Checks.Findings.Severity.Critical),
                w.Status != "ok" ? w.Reason ?? string.Empty : top is null ? "-" : $"{top.Check}{(top.Subject is null ? string.Empty : "/" + top.Subject)} {top.Statistic} = {CheckOutput.Number(top.Value)}",
            };
        }));
        Terminal.WriteTable(output, rows, freeText: "WORST FINDING");
        output.WriteLine();
        if (alerts.Count == 0)
        {
            output.WriteLine("no alert would have opened");
            return;
        }

        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{alerts.Count} alert(s) would have opened:"));
        List<string[]> timeline = [["CHECK", "SUBJECT", "SEVERITY", "OPENED", "RESOLVED"]];
        timeline.AddRange(alerts.Select(a => new[]
        {
            a.Check, a.Subject ?? "-", FindingLine.NameOf(a.Severity), CliJson.Time(a.OpenedAt)!, CliJson.Time(a.ResolvedAt) ?? "still open",
        }));
        Terminal.WriteTable(output, timeline);
    }

    private static string Count(BacktestWindow window, Checks.Findings.Severity severity) =>
        window.Findings.Count(f => f.Severity == severity).ToString(CultureInfo.InvariantCulture);
}
