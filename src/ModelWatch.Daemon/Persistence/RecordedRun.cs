using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Daemon.Persistence;

/// <summary>What writing a run did.</summary>
/// <param name="RunId">The run's id, or null when nothing was written.</param>
/// <param name="Transitions">Alert transitions committed with the run.</param>
/// <param name="LeaseLost">True when this worker no longer held the lease: nothing was written.</param>
/// <param name="AlreadyRecorded">True when the slot had already been recorded (by another replica): only the schedule moved on.</param>
public sealed record RecordedRun(long? RunId, IReadOnlyList<AlertEvent> Transitions, bool LeaseLost, bool AlreadyRecorded);
