using ModelWatch.Checks.Findings;

namespace ModelWatch.Cli.Operations;

/// <summary>An alert a backtest would have opened: its key, its worst severity, and when it opened and resolved.</summary>
internal sealed record TimelineAlert(string Check, string? Subject, Severity Severity, DateTimeOffset OpenedAt, DateTimeOffset? ResolvedAt);
