namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// The answer to a person's claim of one model's lease: claimed with the model's next due slot (null when the daemon
/// has not scheduled it yet), or refused with the worker that holds the lease and until when.
/// </summary>
public sealed record ManualClaim(bool Claimed, DateTimeOffset? NextDueSlot, string? Holder, DateTimeOffset? HeldUntil);
