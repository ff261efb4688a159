using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// Replays the alert policy's decisions as the state database would apply them (see the daemon's alert
/// transitions), in memory: open or raise with no unresolved alert opens one, critical evidence escalates a warning
/// alert, resolve closes it. Times are the slots of the runs that decided.
/// </summary>
internal sealed class AlertTimeline
{
    private readonly List<TimelineAlert> _alerts = [];
    private readonly Dictionary<(string Check, string Subject), int> _unresolved = [];

    /// <summary>Every alert in the order it opened; <see cref="TimelineAlert.ResolvedAt"/> is null for one still open.</summary>
    public IReadOnlyList<TimelineAlert> Alerts => _alerts;

    public void Apply(DateTimeOffset at, IEnumerable<AlertDecision> decisions)
    {
        ArgumentNullException.ThrowIfNull(decisions);
        foreach (AlertDecision decision in decisions)
        {
            var key = (decision.Check, decision.Subject ?? string.Empty);
            Severity severity = decision.EffectiveSeverity;
            bool open = _unresolved.TryGetValue(key, out int index);
            switch (decision.Action)
            {
                case AlertAction.Open or AlertAction.Raise when !open:
                    _unresolved[key] = _alerts.Count;
                    _alerts.Add(new TimelineAlert(decision.Check, decision.Subject, severity, at, null));
                    break;
                case AlertAction.Open or AlertAction.Raise when severity > _alerts[index].Severity:
                    _alerts[index] = _alerts[index] with { Severity = severity };
                    break;
                case AlertAction.Resolve when open:
                    _alerts[index] = _alerts[index] with { ResolvedAt = at };
                    _unresolved.Remove(key);
                    break;
                default:
                    break;
            }
        }
    }
}
