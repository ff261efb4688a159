using System.Globalization;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Persistence;

namespace ModelWatch.Cli.Demo;

/// <summary>How the demo prints alert transitions, and its closing comparison of planted incidents with raised alerts.</summary>
internal static class DemoSummary
{
    private const int ExplanationWidth = 110;

    public static string Describe(ModelAlertEvent transition)
    {
        ArgumentNullException.ThrowIfNull(transition);
        string subject = transition.Check + (transition.Subject is null ? string.Empty : "/" + transition.Subject);
        string explanation = transition.Explanation.Length > ExplanationWidth ? transition.Explanation[..(ExplanationWidth - 1)] + "…" : transition.Explanation;
        return string.Create(CultureInfo.InvariantCulture,
            $"    {DemoRunner.Stamp(new DateTimeOffset(transition.At, TimeSpan.Zero))}  alert #{transition.AlertId} {What(transition),-9} {subject,-28} {SeverityOf(transition),-8} {explanation}");
    }

    // A resolution's evidence is the reassuring finding that ended the alert: the alert's severity beside it would read
    // as a critical finding, so only transitions that raise an alert name a severity.
    private static string SeverityOf(ModelAlertEvent transition) =>
        transition.Transition is "opened" or "escalated" ? transition.Severity : string.Empty;

    /// <summary>The transition in capitals; an alert that follows a resolved one on the same check names it.</summary>
    internal static string What(ModelAlertEvent transition) =>
        transition is { Transition: "opened", PreviousAlertId: { } previous }
            ? string.Create(CultureInfo.InvariantCulture, $"OPENED (again, after #{previous})")
            : transition.Transition.ToUpperInvariant();

    /// <summary>The alert the evidence report is written for: the first on the check the first incident should trip.</summary>
    public static AlertView? MainAlert(IReadOnlyList<AlertView> alerts)
    {
        ArgumentNullException.ThrowIfNull(alerts);
        return DemoScenario.Incidents
            .Select(i => alerts.Where(a => a.Check == i.Check && i.Covers(Utc(a.OpenedAt))).OrderBy(a => a.OpenedAt).FirstOrDefault())
            .FirstOrDefault(a => a is not null)
            ?? alerts.OrderBy(a => a.OpenedAt).FirstOrDefault();
    }

    public static void Write(TextWriter output, RunTally tally, IReadOnlyList<AlertView> alerts)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(alerts);
        output.WriteLine();
        output.WriteLine($"Summary: {tally.Total} of {DemoScenario.ExpectedRuns} runs recorded ({tally.Ok} ok, {tally.Skipped} skipped, {tally.Failed} failed); {alerts.Count} alert(s) raised.");
        int caught = 0;
        foreach (DemoIncident incident in DemoScenario.Incidents)
        {
            List<AlertView> during = alerts.Where(a => incident.Covers(Utc(a.OpenedAt))).OrderBy(a => a.OpenedAt).ToList();
            AlertView? expected = during.FirstOrDefault(a => a.Check == incident.Check);
            caught += expected is null ? 0 : 1;
            string verdict = expected is null
                ? $"NOT caught by {incident.Check}"
                : string.Create(CultureInfo.InvariantCulture, $"caught by {incident.Check} at run {DelayInRuns(incident, expected)} after it began ({DelayInRuns(incident, expected) * DemoScenario.Cadence.TotalHours:F0} h of changed rows; opened {DemoRunner.Stamp(Utc(expected.OpenedAt))})");
            output.WriteLine($"  Incident {incident.Number}, {incident.Name} ({DemoRunner.Stamp(incident.Start)} to {DemoRunner.Stamp(incident.End)}): {verdict}");
            foreach (AlertView alert in during)
            {
                output.WriteLine("    " + Line(alert));
            }
        }

        List<AlertView> clean = alerts.Where(a => !DemoScenario.Incidents.Any(i => i.Covers(Utc(a.OpenedAt)))).OrderBy(a => a.OpenedAt).ToList();
        output.WriteLine(clean.Count == 0
            ? "  Clean periods: no alert opened."
            : $"  Clean periods: {clean.Count} alert(s) opened outside the incidents:");
        foreach (AlertView alert in clean)
        {
            output.WriteLine("    " + Line(alert));
        }

        output.WriteLine($"  {caught} of {DemoScenario.Incidents.Count} incidents caught by the check meant for them. An alert is statistical evidence, not proof: what to do about it stays with the model's owner.");
    }

    /// <summary>
    /// The run of the incident that opened the alert, counting the first run whose window held changed rows as 1: runs
    /// fall on the slots, and a run records its alert well within one cadence of its slot.
    /// </summary>
    internal static int DelayInRuns(DemoIncident incident, AlertView alert) =>
        (int)Math.Floor((Utc(alert.OpenedAt) - incident.Start) / DemoScenario.Cadence);

    private static string Line(AlertView alert)
    {
        string subject = alert.Check + (alert.Subject is null ? string.Empty : "/" + alert.Subject);
        string resolved = alert.ResolvedAt is { } at ? "resolved " + DemoRunner.Stamp(Utc(at)) : "still " + alert.State;
        return $"#{alert.Id.ToString(CultureInfo.InvariantCulture),-4} {subject,-28} {alert.Severity,-8} opened {DemoRunner.Stamp(Utc(alert.OpenedAt))}, {resolved}";
    }

    internal static DateTimeOffset Utc(DateTime time) => new(DateTime.SpecifyKind(time, DateTimeKind.Utc));
}
