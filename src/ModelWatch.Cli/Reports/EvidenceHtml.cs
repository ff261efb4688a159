using System.Globalization;
using System.Net;
using System.Text;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Cli.Output;

namespace ModelWatch.Cli.Reports;

/// <summary>The self-contained HTML page: inline CSS and SVG only, no script, no fonts, no external requests.</summary>
internal static class EvidenceHtml
{
    private const string Style = """
        :root { color-scheme: light; }
        body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; margin: 0; background: #f6f4ef; color: #1f2328; }
        main { max-width: 1100px; margin: 0 auto; padding: 16px; }
        h1 { font-size: 1.35rem; margin: 0.2rem 0 0.4rem; }
        h2 { font-size: 1.1rem; margin: 1.6rem 0 0.5rem; border-bottom: 2px solid #d8d2c4; padding-bottom: 0.2rem; }
        .caution { background: #fff6df; border-left: 5px solid #c0621b; padding: 0.6rem 0.8rem; margin: 0.8rem 0; }
        .facts { margin: 0; padding-left: 1.1rem; }
        .finding { margin: 0.25rem 0; }
        .sev { display: inline-block; min-width: 4.8em; font-weight: 600; }
        .sev.critical { color: #b3123f; } .sev.warning { color: #8a6100; } .sev.ok { color: #2e6b4f; }
        .charts { display: grid; grid-template-columns: repeat(auto-fill, minmax(min(100%, 440px), 1fr)); gap: 12px; }
        figure.chart { margin: 0; background: #fff; border: 1px solid #ddd6c8; border-radius: 6px; padding: 6px; }
        figure.chart svg { width: 100%; height: auto; display: block; }
        svg .title { font-size: 15px; font-weight: 600; fill: #1f2328; }
        svg .tick { font-size: 13px; fill: #555; }
        svg .plot { fill: #fbfaf7; stroke: #cfc8b8; }
        svg .grid { stroke: #e6e0d4; stroke-width: 1; }
        ul.legend { list-style: none; margin: 4px 0 0; padding: 0; display: flex; flex-wrap: wrap; gap: 4px 14px; font-size: 0.8rem; }
        ul.legend .key { display: inline-block; width: 14px; height: 10px; margin-right: 5px; background: var(--key); vertical-align: middle; }
        ul.legend .key.dashed { height: 0; border-top: 3px dashed var(--key); background: none; }
        figcaption { font-size: 0.8rem; color: #555; margin-top: 4px; }
        .runbook dt { font-weight: 600; margin-top: 0.5rem; } .runbook dd { margin-left: 1rem; }
        """;

    public static string Render(Evidence evidence, DateTimeOffset generatedAt)
    {
        var html = new StringBuilder();
        string subject = evidence.Alert is { } a ? $"alert {a.Id.ToString(CultureInfo.InvariantCulture)}" : $"run {evidence.Id.ToString(CultureInfo.InvariantCulture)}";
        html.Append("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\"><meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
        html.Append("<title>").Append(Enc($"ModelWatch evidence: {subject}, model {evidence.Model}")).Append("</title><style>").Append(Style).Append("</style></head><body><main>");
        html.Append("<h1>").Append(Enc($"Evidence for {subject} · model {evidence.Model}")).Append("</h1>");
        html.Append("<ul class=\"facts\">");
        if (evidence.Alert is { } alert)
        {
            Fact(html, $"check {alert.Check}, subject {alert.Subject ?? "model"}: {alert.Severity}, {alert.State}; opened {CliJson.Time(alert.OpenedAt)}" + (alert.ResolvedAt is { } r ? $", resolved {CliJson.Time(r)}" : string.Empty));
        }

        if (evidence.Focus is { } focus)
        {
            Fact(html, $"evidence from run {focus.Id.ToString(CultureInfo.InvariantCulture)}, window {CliJson.Time(focus.WindowStart)} → {CliJson.Time(focus.WindowEnd)}, {focus.RowsRead.ToString(CultureInfo.InvariantCulture)} rows, {focus.Status}");
            IReadOnlyList<string> features = EvidenceText.FeaturesInvolved(focus);
            Fact(html, "features involved: " + (features.Count == 0 ? "none named" : string.Join(", ", features)));
            if (evidence.Latest(Checks.Findings.CheckNames.Error, "chow_predictive")?.Finding is { } error
                && error.Detail("share_noise") is { } noise && error.Detail("share_level_drift") is { } level && error.Detail("share_slope_drift") is { } slope)
            {
                Fact(html, $"error increase over baseline (run {error.RunId.ToString(CultureInfo.InvariantCulture)}): noise {EvidenceText.Pct(noise)}, level drift {EvidenceText.Pct(level)}, slope drift {EvidenceText.Pct(slope)}");
            }
        }

        Fact(html, $"history: {evidence.Runs.Count.ToString(CultureInfo.InvariantCulture)} runs of the model (at most {EvidenceLoader.HistoryRuns.ToString(CultureInfo.InvariantCulture)}); generated {CliJson.Time(generatedAt)}");
        html.Append("</ul>");
        html.Append("<p class=\"caution\">").Append(Enc(RunbookHints.Caution)).Append("</p>");

        if (evidence.Focus is { } run)
        {
            html.Append("<h2>What moved</h2>");
            List<EvidenceFinding> shown = [.. run.Findings.Where(f => f.Severity == "critical").OrderBy(f => f.Check == evidence.Alert?.Check ? 0 : 1)];
            if (shown.Count == 0)
            {
                shown = [.. run.Findings.Where(f => f.Severity == "warning")];
            }

            html.Append(shown.Count == 0 ? "<p>Nothing above ok in this run.</p>" : string.Empty);
            foreach (EvidenceFinding f in shown)
            {
                html.Append("<p class=\"finding\"><span class=\"sev ").Append(f.Severity).Append("\">").Append(f.Severity).Append("</span> ")
                    .Append(Enc($"{f.Check} {f.Statistic} ({f.SubjectText}): {f.Explanation}")).Append("</p>");
            }
        }

        Section(html, "Coefficients over time", EvidenceCharts.Coefficients(evidence), "No coefficient tests in the history.");
        Section(html, "Error and its decomposition", EvidenceCharts.Error(evidence), "No error tests in the history.");
        Section(html, "Residual distribution", Some(EvidenceCharts.Residuals(evidence)), "The baseline holds no residual sample.");
        Section(html, "Feature drift", Some(EvidenceCharts.Psi(evidence)), "No PSI measured in the history.");
        Section(html, "Collinearity", Some(EvidenceCharts.Condition(evidence)), "No condition number in the history.");
        Runbook(html, evidence);
        html.Append("</main></body></html>\n");
        return html.ToString();
    }

    private static void Section(StringBuilder html, string title, IEnumerable<string> charts, string empty)
    {
        List<string> list = [.. charts];
        html.Append("<h2>").Append(Enc(title)).Append("</h2>");
        html.Append(list.Count == 0 ? "<p>" + Enc(empty) + "</p>" : "<div class=\"charts\">" + string.Concat(list) + "</div>");
    }

    private static void Runbook(StringBuilder html, Evidence evidence)
    {
        HashSet<string> checks = [.. evidence.Focus?.Findings.Where(f => f.Severity != "ok").Select(f => f.Check) ?? []];
        if (evidence.Alert is { } alert)
        {
            checks.Add(alert.Check);
        }

        html.Append("<h2>Runbook</h2><dl class=\"runbook\">");
        foreach (RunbookEntry hint in RunbookHints.All.Where(h => checks.Contains(h.Check)))
        {
            html.Append("<dt>").Append(Enc(hint.Check)).Append("</dt>");
            html.Append("<dd><b>What it means.</b> ").Append(Enc(hint.Meaning)).Append("</dd>");
            html.Append("<dd><b>How to confirm.</b> ").Append(Enc(hint.Confirm)).Append("</dd>");
            html.Append("<dd><b>What to do.</b> ").Append(Enc(hint.Act)).Append("</dd>");
        }

        html.Append("</dl>");
    }

    private static IEnumerable<string> Some(string? chart) => chart is null ? [] : [chart];

    private static void Fact(StringBuilder html, string text) => html.Append("<li>").Append(Enc(text)).Append("</li>");

    private static string Enc(string text) => WebUtility.HtmlEncode(text);
}
