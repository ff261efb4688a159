using System.Globalization;
using System.Text;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The evidence report as one self-contained HTML page: inline CSS and SVG only, no script, no fonts, no external
/// requests. The same page is written by <c>explain --html</c> and served by the daemon at <c>/alerts/{id}</c>; served,
/// it also links back to the fleet and the model.
/// </summary>
internal static class EvidenceHtml
{
    /// <param name="evidence">What to show.</param>
    /// <param name="generatedAt">When the page was made, printed on it.</param>
    /// <param name="served">Add links to the daemon's other pages (they do not exist next to a file).</param>
    public static string Render(Evidence evidence, DateTimeOffset generatedAt, bool served = false)
    {
        string subject = evidence.Alert is { } a ? $"alert #{Id(a.Id)}" : $"run #{Id(evidence.Id)}";
        string? nav = served ? $"<a href=\"/\">fleet</a> › <a href=\"/models/{Uri.EscapeDataString(evidence.Model)}\">{Enc(evidence.Model)}</a> › {Enc(subject)}" : null;
        StringBuilder html = PageLayout.Begin($"ModelWatch evidence: {subject}, model {evidence.Model}", nav);
        html.Append("<h1>").Append(Enc(evidence.Alert is { } h ? $"{h.Severity} alert #{Id(h.Id)}: {h.Check} ({h.Subject ?? "model"}) · model {evidence.Model}" : $"Evidence for {subject} · model {evidence.Model}")).Append("</h1>");
        Facts(html, evidence, generatedAt, served);
        html.Append("<p class=\"caution\">").Append(Enc(RunbookHints.Caution)).Append("</p>");
        Moved(html, evidence);
        Decomposition(html, evidence);
        Charts(html, evidence);
        History(html, evidence.History);
        Runbook(html, evidence);
        return PageLayout.End(html);
    }

    private static void Facts(StringBuilder html, Evidence evidence, DateTimeOffset generatedAt, bool served)
    {
        html.Append("<ul class=\"facts\">");
        if (evidence.Alert is { } alert)
        {
            Fact(html, $"{alert.State}; opened {Readable(alert.OpenedAt)}" + (alert.AcknowledgedAt is { } k ? $", acknowledged {Readable(k)} by {alert.AcknowledgedBy}" : string.Empty) + (alert.ResolvedAt is { } r ? $", resolved {Readable(r)}" : string.Empty));
            if (evidence.PreviousAlertId is { } previous)
            {
                string text = "again, after #" + Id(previous);
                html.Append("<li>").Append(served ? $"<a href=\"/alerts/{Id(previous)}\">{Enc(text)}</a>" : Enc(text))
                    .Append(Enc(": the same condition was alerted before, resolved, and has come back")).Append("</li>");
            }

            if (alert.Explanation is { } latest)
            {
                Fact(html, "latest evidence: " + latest);
            }
        }

        if (evidence.Focus is { } focus)
        {
            Fact(html, $"evidence from run #{Id(focus.Id)}: window {Window(focus)}, {focus.RowsRead.ToString(CultureInfo.InvariantCulture)} rows, {focus.Status}" + (focus.Reason is { } why ? $" ({why})" : string.Empty));
            IReadOnlyList<string> features = EvidenceFacts.FeaturesInvolved(focus);
            Fact(html, "features involved: " + (features.Count == 0 ? "none named by this run's findings" : string.Join(", ", features)));
        }
        else if (evidence.Alert is not null)
        {
            Fact(html, "the run behind this evidence has been pruned from the history; only the alert record remains");
        }

        if (evidence.Outcome is { } outcome)
        {
            Fact(html, $"outcome {outcome.Column}" + (outcome.Unit is { } unit ? $", in {unit}" : " (the spec names no unit)"));
        }

        Fact(html, $"history: {evidence.Runs.Count.ToString(CultureInfo.InvariantCulture)} runs of the model (at most {EvidenceLoader.HistoryRuns.ToString(CultureInfo.InvariantCulture)}); times in UTC; page made {EvidenceFacts.Readable(generatedAt)}");
        html.Append("</ul>");
    }

    private static void Moved(StringBuilder html, Evidence evidence)
    {
        if (evidence.Focus is not { } run)
        {
            return;
        }

        List<EvidenceFinding> critical = [.. run.Findings.Where(f => f.Severity == "critical").OrderBy(f => f.Check == evidence.Alert?.Check ? 0 : 1)];
        List<EvidenceFinding> shown = critical.Count > 0 ? critical : [.. run.Findings.Where(f => f.Severity == "warning")];
        html.Append("<h2>What moved</h2>");
        html.Append(shown.Count == 0 ? "<p>Nothing above ok in this run.</p>" : critical.Count == 0 ? "<p>Nothing critical in this run; its warnings:</p>" : string.Empty);
        // The alert's own check first; the rest of a busy run folds away so the page starts with what was asked about.
        string? own = evidence.Alert?.Check;
        List<EvidenceFinding> first = own is null ? shown : [.. shown.Where(f => f.Check == own)];
        List<EvidenceFinding> rest = own is null ? [] : [.. shown.Where(f => f.Check != own)];
        foreach (EvidenceFinding f in first)
        {
            Finding(html, f);
        }

        if (rest.Count > 0)
        {
            html.Append("<details class=\"more\"").Append(first.Count == 0 ? " open" : string.Empty).Append("><summary>")
                .Append(Enc($"{rest.Count.ToString(CultureInfo.InvariantCulture)} more {(critical.Count > 0 ? "critical" : "warning")} finding(s) of other checks in this run ({string.Join(", ", rest.Select(f => f.Check).Distinct())})"))
                .Append("</summary>");
            foreach (EvidenceFinding f in rest)
            {
                Finding(html, f);
            }

            html.Append("</details>");
        }
    }

    private static void Finding(StringBuilder html, EvidenceFinding f) =>
        html.Append("<p class=\"finding\"><span class=\"sev ").Append(f.Severity).Append("\">").Append(f.Severity).Append("</span> ")
            .Append(Enc($"{f.Check} {f.Statistic} ({f.SubjectText}): {f.Explanation}")).Append("</p>");

    private static void Decomposition(StringBuilder html, Evidence evidence)
    {
        if (evidence.Latest(CheckNames.Error, "chow_predictive") is not var (run, error))
        {
            return;
        }

        html.Append("<h2>Why the error grew</h2>");
        string from = run.Id == evidence.Focus?.Id ? "this run" : $"run #{Id(run.Id)}, the latest that tested the error";
        string unit = evidence.Outcome?.Unit is { } u ? " " + u : string.Empty;
        if (error.Detail("rmse") is { } rmse && error.Detail("mse_reference") is { } reference)
        {
            html.Append("<p>").Append(Enc($"In {from}, the deployed model's RMSE was {EvidenceFacts.Num(rmse)}{unit} against the baseline's {EvidenceFacts.Num(Math.Sqrt(reference))}{unit}.")).Append("</p>");
        }

        if (error.Detail("share_noise") is { } noise && error.Detail("share_level_drift") is { } level && error.Detail("share_slope_drift") is { } slope)
        {
            html.Append("<table class=\"rows small\"><thead><tr><th>part of the increase</th><th>share</th><th>what it means</th></tr></thead><tbody>");
            Share(html, "noise", noise, Math.Round(noise * 100) < 0 ? "negative: this window is less noisy than the baseline, so noise took error away"
                : Math.Round(noise * 100) == 0 ? "the window is about as noisy as the baseline" : "the window's own unavoidable error grew");
            Share(html, "level drift", level, "the predictions are off by a constant amount");
            Share(html, "slope drift", slope, "the features' coefficients moved");
            html.Append("</tbody></table>");
            html.Append("<p class=\"explain\">").Append(Enc(EvidenceFacts.SharesExplained)).Append("</p>");
        }
        else
        {
            html.Append("<p>The error did not increase over the baseline, so there is nothing to split.</p>");
        }
    }

    private static void Share(StringBuilder html, string part, double share, string meaning) =>
        html.Append("<tr><td data-label=\"part\">").Append(Enc(part)).Append("</td><td data-label=\"share\" class=\"num\">").Append(Enc(EvidenceFacts.Pct(share)))
            .Append("</td><td data-label=\"meaning\">").Append(Enc(meaning)).Append("</td></tr>");

    private static void Charts(StringBuilder html, Evidence evidence)
    {
        IReadOnlyList<EvidenceChart> charts = EvidenceCharts.All(evidence);
        if (evidence.Alert is { } alert)
        {
            List<EvidenceChart> own = [.. charts.Where(c => c.IsAbout(alert.Check, alert.Subject))];
            html.Append("<h2>").Append(Enc($"The alert's own evidence: {alert.Check} ({alert.Subject ?? "model"})")).Append("</h2>");
            Grid(html, own, alert.Check is CheckNames.Source or CheckNames.Data or CheckNames.Serving
                ? "This check has no chart: its evidence is the text above."
                : "No chart of this check in the history (its runs may be pruned).");
            html.Append("<h2>The rest of the model's evidence over the same runs</h2>");
            Grid(html, [.. charts.Where(c => !c.IsAbout(alert.Check, alert.Subject))], "Nothing else to chart in the history.");
        }
        else
        {
            html.Append("<h2>Charts over the model's recent runs</h2>");
            Grid(html, charts, "Nothing to chart in the history.");
        }
    }

    private static void Grid(StringBuilder html, IReadOnlyList<EvidenceChart> charts, string empty) =>
        html.Append(charts.Count == 0 ? "<p>" + Enc(empty) + "</p>" : "<div class=\"charts\">" + string.Concat(charts.Select(c => c.Html)) + "</div>");

    private static void History(StringBuilder html, IReadOnlyList<AlertHistoryEntry> history)
    {
        if (history.Count == 0)
        {
            return;
        }

        html.Append("<h2>The alert's history</h2><table class=\"rows\"><thead><tr><th>when</th><th>what</th><th>severity</th><th>by</th><th>run</th><th>explanation</th></tr></thead><tbody>");
        foreach (AlertHistoryEntry entry in history)
        {
            html.Append("<tr>")
                .Append("<td data-label=\"when\" class=\"nowrap\">").Append(Enc(Readable(entry.At))).Append("</td>").Append(Cell("what", entry.Transition)).Append(Cell("severity", entry.Severity))
                .Append(Cell("by", entry.Actor)).Append(Cell("run", entry.RunId is { } r ? "#" + Id(r) : "-")).Append(Cell("explanation", entry.Explanation))
                .Append("</tr>");
        }

        html.Append("</tbody></table>");
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

    private static string Cell(string label, string? text) => $"<td data-label=\"{Enc(label)}\">{Enc(text)}</td>";

    private static void Fact(StringBuilder html, string text) => html.Append("<li>").Append(Enc(text)).Append("</li>");

    private static string Window(EvidenceRun run) => run.WindowStart is { } s && run.WindowEnd is { } e
        ? $"{s.UtcDateTime.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture)} to {EvidenceFacts.Readable(e)}"
        : "none";

    private static string Readable(DateTime utc) => EvidenceFacts.Readable(new DateTimeOffset(DateTime.SpecifyKind(utc, DateTimeKind.Utc)));

    private static string Id(long id) => id.ToString(CultureInfo.InvariantCulture);

    private static string Enc(string? text) => PageLayout.Enc(text);
}
