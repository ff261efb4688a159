namespace ModelWatch.Daemon.Evidence;

/// <summary>One rendered chart and what it is about, so the charts of an alert's subject can be shown first.</summary>
/// <param name="Check">The check whose findings it draws.</param>
/// <param name="Subject">The coefficient or feature it is about, or null for the model as a whole.</param>
/// <param name="Html">The figure.</param>
internal sealed record EvidenceChart(string Check, string? Subject, string Html)
{
    /// <summary>Whether the chart shows the alert's own check and subject (any chart of its check for a model-wide alert).</summary>
    public bool IsAbout(string check, string? subject) => Check == check && (subject is null || Subject is null || Subject == subject);
}
