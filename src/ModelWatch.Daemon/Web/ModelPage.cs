using System.Globalization;
using System.Text;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Evidence;

namespace ModelWatch.Daemon.Web;

/// <summary>The page at <c>/models/{key}</c>: open alerts, recent runs and the charts over the model's history.</summary>
internal static class ModelPage
{
    private const int RunsShown = 30;

    public static string Render(Evidence.Evidence evidence, IReadOnlyList<AlertView> open, DateTimeOffset now)
    {
        string key = evidence.Model;
        StringBuilder html = PageLayout.Begin($"ModelWatch: model {key}", $"<a href=\"/\">fleet</a> › {Enc(key)}");
        html.Append("<h1>").Append(Enc("Model " + key)).Append("</h1>");
        html.Append("<p>").Append(Enc($"{evidence.Runs.Count.ToString(CultureInfo.InvariantCulture)} recent runs; baseline " +
            (evidence.Baseline is { } b ? $"v{b.Version.ToString(CultureInfo.InvariantCulture)}" : "none") +
            (evidence.Outcome is { } o ? $"; outcome {o.Column}" + (o.Unit is { } u ? $" in {u}" : string.Empty) : string.Empty) +
            $"; page made {EvidenceFacts.Readable(now)}.")).Append("</p>");

        html.Append("<h2>Open alerts</h2>");
        if (open.Count == 0)
        {
            html.Append("<p>None.</p>");
        }
        else
        {
            html.Append("<table class=\"rows\"><thead><tr><th>alert</th><th>severity</th><th>check (subject)</th><th>state</th><th>opened (UTC)</th><th>latest evidence</th></tr></thead><tbody>");
            foreach (AlertView alert in open.OrderBy(a => a.Severity == "critical" ? 0 : 1).ThenByDescending(a => a.OpenedAt))
            {
                string id = alert.Id.ToString(CultureInfo.InvariantCulture);
                html.Append("<tr>")
                    .Append($"<td data-label=\"alert\" class=\"nowrap\"><a href=\"/alerts/{id}\">#{id} evidence</a></td>")
                    .Append($"<td data-label=\"severity\"><span class=\"sev {Enc(alert.Severity)}\">{Enc(alert.Severity)}</span></td>")
                    .Append(Cell("check", $"{alert.Check} ({alert.Subject ?? "model"})"))
                    .Append(Cell("state", alert.State))
                    .Append($"<td data-label=\"opened\" class=\"nowrap\">{Enc(FleetPage.Short(alert.OpenedAt))}</td>")
                    .Append(Cell("latest evidence", alert.Explanation ?? "-"))
                    .Append("</tr>");
            }

            html.Append("</tbody></table>");
        }

        IReadOnlyList<EvidenceChart> charts = EvidenceCharts.All(evidence);
        html.Append("<h2>Charts over the recent runs</h2>");
        html.Append(charts.Count == 0 ? "<p>Nothing to chart yet.</p>" : "<div class=\"charts\">" + string.Concat(charts.Select(c => c.Html)) + "</div>");

        html.Append("<h2>Recent runs</h2>");
        if (evidence.Runs.Count == 0)
        {
            html.Append("<p>No run yet.</p>");
        }
        else
        {
            html.Append("<table class=\"rows\"><thead><tr><th>run</th><th>window end (UTC)</th><th>status</th><th>rows</th><th>worst finding</th><th>critical findings by check</th></tr></thead><tbody>");
            foreach (EvidenceRun run in evidence.Runs.Reverse().Take(RunsShown))
            {
                string worst = run.Findings.Any(f => f.Severity == "critical") ? "critical" : run.Findings.Any(f => f.Severity == "warning") ? "warning" : run.Findings.Count > 0 ? "ok" : "-";
                string critical = string.Join(", ", run.Findings.Where(f => f.Severity == "critical").GroupBy(f => f.Check)
                    .Select(g => g.Count() == 1 ? g.Key : $"{g.Key} ×{g.Count().ToString(CultureInfo.InvariantCulture)}"));
                html.Append("<tr>")
                    .Append(Cell("run", "#" + run.Id.ToString(CultureInfo.InvariantCulture)))
                    .Append($"<td data-label=\"window end\" class=\"nowrap\">{run.At.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture)}</td>")
                    .Append($"<td data-label=\"status\"><span class=\"sev {Enc(run.Status)}\">{Enc(run.Status)}</span>{(run.Reason is { } why ? " " + Enc(why) : string.Empty)}</td>")
                    .Append($"<td data-label=\"rows\" class=\"num\">{run.RowsRead.ToString(CultureInfo.InvariantCulture)}</td>")
                    .Append($"<td data-label=\"worst finding\"><span class=\"sev {worst}\">{worst}</span></td>")
                    .Append(Cell("critical findings", critical.Length == 0 ? "-" : critical))
                    .Append("</tr>");
            }

            html.Append("</tbody></table>");
            if (evidence.Runs.Count > RunsShown)
            {
                html.Append("<p class=\"muted\">").Append(Enc($"The newest {RunsShown.ToString(CultureInfo.InvariantCulture)} of {evidence.Runs.Count.ToString(CultureInfo.InvariantCulture)} runs; 'modelwatch runs {key}' lists more.")).Append("</p>");
            }
        }

        return PageLayout.End(html);
    }

    private static string Cell(string label, string text) => $"<td data-label=\"{Enc(label)}\">{Enc(text)}</td>";

    private static string Enc(string? text) => PageLayout.Enc(text);
}
