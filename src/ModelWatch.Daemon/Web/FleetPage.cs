using System.Globalization;
using System.Text;
using ModelWatch.Daemon.Evidence;
using ModelWatch.Daemon.Fleet;

namespace ModelWatch.Daemon.Web;

/// <summary>The page at <c>/</c>: one row per model, the models that need someone first.</summary>
internal static class FleetPage
{
    public static string Render(IReadOnlyList<ModelStatus> rows, DateTimeOffset now)
    {
        StringBuilder html = PageLayout.Begin("ModelWatch: fleet");
        html.Append("<h1>Fleet</h1>");
        int critical = rows.Count(r => r.OpenCritical > 0), failing = rows.Count(r => r.FailingRuns > 0);
        html.Append("<p>").Append(Enc($"{Count(rows.Count, "model")}; {Count(critical, "model")} with open critical alerts; {Count(failing, "model")} whose last run failed. Page made {EvidenceFacts.Readable(now)}; read only."))
            .Append("</p>");
        if (rows.Count == 0)
        {
            html.Append("<p>No model is registered. Put specs in the daemon's Specs:Directory or run 'modelwatch model apply'.</p>");
            return PageLayout.End(html);
        }

        html.Append("<table class=\"rows\"><thead><tr><th>model</th><th>enabled</th><th>last run (UTC)</th><th>last run status</th><th>worst finding of last run</th>")
            .Append("<th>open alerts</th><th>quiet until (UTC)</th><th>baseline</th><th>failed runs in a row</th></tr></thead><tbody>");
        foreach (ModelStatus row in rows.OrderBy(Urgency).ThenBy(r => r.Key, StringComparer.Ordinal))
        {
            string key = Uri.EscapeDataString(row.Key);
            html.Append("<tr>");
            html.Append($"<td data-label=\"model\" class=\"nowrap\"><a href=\"/models/{key}\">{Enc(row.Key)}</a></td>");
            Cell(html, "enabled", row.Enabled ? "yes" : "no (paused)");
            html.Append($"<td data-label=\"last run (UTC)\" class=\"nowrap\">{Enc(row.LastRunAt is { } at ? Short(at) : "never")}</td>");
            html.Append($"<td data-label=\"last run status\"><span class=\"sev {Enc(row.LastStatus)}\">{Enc(row.LastStatus ?? "-")}</span></td>");
            html.Append($"<td data-label=\"worst finding\"><span class=\"sev {Enc(row.WorstSeverity)}\">{Enc(row.WorstSeverity ?? "-")}</span></td>");
            string alerts = row.OpenCritical + row.OpenWarning == 0 ? "none" : $"{row.OpenCritical.ToString(CultureInfo.InvariantCulture)} critical, {row.OpenWarning.ToString(CultureInfo.InvariantCulture)} warning";
            html.Append($"<td data-label=\"open alerts\">{(row.OpenCritical > 0 ? "<span class=\"sev critical\">" + Enc(alerts) + "</span>" : Enc(alerts))}</td>");
            Cell(html, "quiet until", row.QuietUntil is { } q ? Short(q) + (row.QuietPeriods > 1 ? $" ({row.QuietPeriods.ToString(CultureInfo.InvariantCulture)} periods)" : string.Empty) : "-");
            Cell(html, "baseline", row.BaselineVersion is { } v ? $"v{v.ToString(CultureInfo.InvariantCulture)}, {Age(row.BaselineCreatedAt, now)} old" : "none (runs are skipped)");
            html.Append($"<td data-label=\"failed runs in a row\" class=\"num\">{(row.FailingRuns > 0 ? "<span class=\"sev failed\">" + row.FailingRuns.ToString(CultureInfo.InvariantCulture) + "</span>" : "0")}</td>");
            html.Append("</tr>");
        }

        html.Append("</tbody></table>");
        html.Append("<p class=\"muted\">Sorted with open critical alerts and failing runs first. An alert is statistical evidence, not proof; open a model for its runs and charts.</p>");
        return PageLayout.End(html);
    }

    private static int Urgency(ModelStatus row) => row.OpenCritical > 0 ? 0 : row.FailingRuns > 0 ? 1 : row.OpenWarning > 0 ? 2 : 3;

    private static string Count(int n, string what) => n.ToString(CultureInfo.InvariantCulture) + " " + what + (n == 1 ? string.Empty : "s");

    internal static string Short(DateTime utc) => DateTime.SpecifyKind(utc, DateTimeKind.Utc).ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture);

    internal static string Age(DateTime? utc, DateTimeOffset now)
    {
        if (utc is not { } at)
        {
            return "?";
        }

        TimeSpan age = now - new DateTimeOffset(DateTime.SpecifyKind(at, DateTimeKind.Utc));
        return age.TotalDays >= 2 ? $"{Math.Floor(age.TotalDays).ToString(CultureInfo.InvariantCulture)} days"
            : age.TotalHours >= 2 ? $"{Math.Floor(age.TotalHours).ToString(CultureInfo.InvariantCulture)} hours"
            : $"{Math.Max(0, Math.Floor(age.TotalMinutes)).ToString(CultureInfo.InvariantCulture)} minutes";
    }

    private static void Cell(StringBuilder html, string label, string text) => html.Append($"<td data-label=\"{Enc(label)}\">{Enc(text)}</td>");

    private static string Enc(string? text) => PageLayout.Enc(text);
}
