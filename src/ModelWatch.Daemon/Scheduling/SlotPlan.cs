namespace ModelWatch.Daemon.Scheduling;

/// <summary>Which slot a claimed model runs now, how many missed slots are passed over, and when it is due next.</summary>
/// <param name="RunSlot">The slot this run belongs to.</param>
/// <param name="PassedOver">Missed slots that will not run (documented missed-slot policy).</param>
/// <param name="NextDue">The slot after <paramref name="RunSlot"/>.</param>
public sealed record SlotPlan(DateTimeOffset RunSlot, int PassedOver, DateTimeOffset NextDue);
