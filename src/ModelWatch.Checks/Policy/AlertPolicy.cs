using System.Globalization;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// Turns successive runs' findings into alert decisions per (check, subject). Pure. Per-run tests must persist
/// (critical in <see cref="CheckThresholds.PersistenceRequired"/> of the last <see cref="CheckThresholds.PersistenceWindows"/>
/// evaluated runs, consecutive runs whatever the windows' overlap); sequential and hard findings (a CUSUM or monitor
/// crossing, a block of new rows, lost rank, a dead feed, served mismatches) open at once. An open alert resolves after
/// <see cref="CheckThresholds.ResolveAfterOkWindows"/> evaluated runs in a row with nothing above ok (hysteresis); a
/// warning keeps it open. By default only critical evidence opens alerts: warnings are findings, not pages. With
/// <see cref="CheckThresholds.WarningAlerts"/>, persisting warnings (the same count of runs, at warning or above) open a
/// warning alert, which critical evidence (at once or persisted, as above) escalates. Skipped findings leave the state
/// untouched.
/// </summary>
public static class AlertPolicy
{
    /// <summary>Decides for every (check, subject) that has findings this run or a persisted state.</summary>
    public static IReadOnlyList<AlertDecision> Evaluate(
        IEnumerable<CheckResult> results,
        IEnumerable<AlertPolicyState> previous,
        string baselineFingerprint,
        CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(results);
        ArgumentNullException.ThrowIfNull(previous);
        ArgumentNullException.ThrowIfNull(thresholds);
        var states = previous.ToDictionary(s => (s.Check, s.Subject ?? string.Empty));
        var byKey = results.SelectMany(r => r.Findings).GroupBy(f => (f.Check, f.Subject ?? string.Empty)).ToDictionary(g => g.Key, g => g.ToList());
        var decisions = new List<AlertDecision>();
        foreach (var key in states.Keys.Union(byKey.Keys).OrderBy(k => k.Check, StringComparer.Ordinal).ThenBy(k => k.Item2, StringComparer.Ordinal))
        {
            AlertPolicyState state = states.TryGetValue(key, out AlertPolicyState? s) ? s : new AlertPolicyState { Check = key.Check, Subject = key.Item2.Length == 0 ? null : key.Item2 };
            if (state.BaselineFingerprint != baselineFingerprint)
            {
                state = state with { BaselineFingerprint = baselineFingerprint, Recent = [] };
            }

            List<Finding> findings = byKey.TryGetValue(key, out List<Finding>? f) ? f.Where(x => !x.Skipped).ToList() : [];
            decisions.Add(Decide(state, findings, thresholds));
        }

        return decisions;
    }

    private static AlertDecision Decide(AlertPolicyState state, List<Finding> findings, CheckThresholds t)
    {
        if (findings.Count == 0)
        {
            return new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.None, Reason = "no evaluated finding this run", State = state };
        }

        Finding worst = findings.OrderByDescending(x => x.Severity).First();
        Severity immediate = findings.Where(x => !x.RequiresPersistence).Select(x => x.Severity).DefaultIfEmpty(Severity.Ok).Max();
        var persistent = findings.Where(x => x.RequiresPersistence).ToList();
        IReadOnlyList<Severity> recent = state.Recent;
        if (persistent.Count > 0)
        {
            recent = [.. state.Recent.Skip(Math.Max(0, state.Recent.Count - t.PersistenceWindows + 1)), persistent.Max(x => x.Severity)];
        }

        int criticalCount = persistent.Count > 0 ? recent.Count(x => x == Severity.Critical) : 0;
        int elevatedCount = persistent.Count > 0 ? recent.Count(x => x >= Severity.Warning) : 0;
        bool persisted = criticalCount >= t.PersistenceRequired;
        bool critical = immediate == Severity.Critical || persisted;
        bool warned = t.WarningAlerts && elevatedCount >= t.PersistenceRequired;
        string evidence = string.Create(CultureInfo.InvariantCulture, $"{criticalCount} of the last {recent.Count} runs critical");
        AlertPolicyState next = state with { Recent = recent };
        if (!state.Open)
        {
            if (critical)
            {
                return new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.Open, AlertSeverity = Severity.Critical, Evidence = worst, Reason = immediate == Severity.Critical ? "critical evidence that needs no repetition" : evidence, State = next with { Open = true, ConsecutiveOk = 0 } };
            }

            if (warned)
            {
                // The evidence shown is the worst persistent finding: a warning alert is about the per-run tests.
                Finding shown = persistent.OrderByDescending(x => x.Severity).First();
                string reason = string.Create(CultureInfo.InvariantCulture, $"{elevatedCount} of the last {recent.Count} runs at warning or above");
                return new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.Open, AlertSeverity = Severity.Warning, Evidence = shown, Reason = reason, State = next with { Open = true, ConsecutiveOk = 0 } };
            }

            return new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.None, Evidence = worst, Reason = worst.Severity == Severity.Critical ? evidence + "; waiting for persistence" : "nothing critical", State = next };
        }

        if (worst.Severity == Severity.Critical)
        {
            // Critical evidence that meets the opening rule escalates a warning alert; with warning alerts on, a lone
            // critical run only refreshes it (without them every open alert is critical, and stays so).
            Severity raised = critical || !t.WarningAlerts ? Severity.Critical : Severity.Warning;
            return new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.Raise, AlertSeverity = raised, Evidence = worst, Reason = raised == Severity.Critical ? "still critical" : evidence + "; not enough to escalate a warning alert", State = next with { ConsecutiveOk = 0 } };
        }

        int ok = worst.Severity == Severity.Ok ? state.ConsecutiveOk + 1 : 0;
        int needed = CheckRegistry.Find(state.Check) is { ResolvesOnFirstOkRun: true } ? 1 : t.ResolveAfterOkWindows;
        return ok >= needed
            ? new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.Resolve, Evidence = worst, Reason = string.Create(CultureInfo.InvariantCulture, $"{ok} evaluated runs in a row with nothing above ok"), State = next with { Open = false, ConsecutiveOk = 0 } }
            : new AlertDecision { Check = state.Check, Subject = state.Subject, Action = AlertAction.None, Evidence = worst, Reason = worst.Severity == Severity.Warning ? "warning keeps the alert open" : string.Create(CultureInfo.InvariantCulture, $"ok for {ok} of {needed} runs needed to resolve"), State = next with { ConsecutiveOk = ok } };
    }
}
