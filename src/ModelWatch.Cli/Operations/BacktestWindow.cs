namespace ModelWatch.Cli.Operations;

/// <summary>One backtest window: its slot and time range, the run's status and reason, and the findings of tests that ran.</summary>
internal sealed record BacktestWindow(DateTimeOffset Slot, DateTimeOffset? Start, DateTimeOffset? End, string Status, string? Reason, IReadOnlyList<FindingLine> Findings);
