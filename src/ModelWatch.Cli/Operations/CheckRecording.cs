using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Store.Models;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// <c>check --record</c>: runs and records one slot the way a daemon replica does — claim the model's lease, run
/// the pipeline with the memory kept in the state database, record under the lease — except that the model's next
/// due slot is left as it was, so the daemon's schedule does not move. The unique (model, slot) key means a slot
/// that is already recorded is never recorded twice.
/// </summary>
internal static class CheckRecording
{
    /// <summary>The lease owner and actor of a person's recorded check: <c>check:user@host</c> (see <see cref="Actors"/>).</summary>
    public static string Worker => Actors.CheckRun;

    /// <summary>
    /// Refuses a slot behind the model's recorded history: the memory kept in the state database belongs to the newest
    /// recorded run, so a slot before it would be run with memory from its future and recorded out of order. A slot
    /// after the newest recorded one (the next due slot, or one the daemon passed over since) is recorded with the
    /// memory as it stood then; the newest recorded slot itself is left to the recorder, which writes nothing twice.
    /// </summary>
    public static async Task EnsureInOrderAsync(OperationServices services, ModelRecord model, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        if (await services.ManualRuns.NewestRecordedSlotAsync(model.Key, cancellationToken) is { } newest && newest > slot)
        {
            throw new OperationRefusal(
                $"model {model.Key}: slot {CliJson.Time(slot)} is behind the recorded history (the newest recorded slot is {CliJson.Time(newest)}), " +
                "and --record adds slots in order only. Drop --record to see the slot as it stood then, or run " +
                $"'modelwatch backtest {model.Key} --from <first slot> --to {CliJson.Time(slot)}'.");
        }
    }

    /// <summary>Runs and records the slot; returns the outcome and a line that says what was written.</summary>
    public static async Task<(RunOutcome Outcome, string Note)> RunAsync(OperationServices services, ModelRecord model, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        string worker = Worker;
        DateTimeOffset claimedAt = services.Time.GetUtcNow();
        DateTimeOffset nextDue = await ClaimAsync(services, model, worker, claimedAt, cancellationToken);
        bool released = false;
        try
        {
            RunOutcome outcome = await services.Pipeline.ExecuteAsync(model, slot, services.Recorder, cancellationToken);
            RecordedRun recorded = await services.Recorder.RecordAsync(outcome, worker, nextDue, services.Time.GetUtcNow(), cancellationToken);
            // The recording transaction clears the lease itself; only a lost lease (someone else holds it now) is left alone.
            released = !recorded.LeaseLost;
            if (recorded.LeaseLost)
            {
                throw new OperationException($"model {model.Key}: the lease of {worker} expired before slot {CliJson.Time(slot)} was recorded; nothing was written");
            }

            string note = recorded.AlreadyRecorded
                ? $"slot {CliJson.Time(slot)} of model {model.Key} was already recorded; nothing was written"
                : $"recorded run {recorded.RunId} for slot {CliJson.Time(slot)} of model {model.Key} ({recorded.Transitions.Count} alert transition(s))";
            return (outcome, note);
        }
        finally
        {
            if (!released)
            {
                await services.Leases.ReleaseAsync(worker, model.Key, CancellationToken.None);
            }
        }
    }

    private static async Task<DateTimeOffset> ClaimAsync(OperationServices services, ModelRecord model, string worker, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ManualClaim claim = await services.ManualRuns.ClaimAsync(model.Key, worker, now, services.LeaseDuration, cancellationToken);
        if (!claim.Claimed)
        {
            throw new OperationException($"model {model.Key}: {claim.Holder ?? "another worker"} holds the lease until {CliJson.Time(claim.HeldUntil) ?? "?"} (it is running the model now); try again after that");
        }

        // A model the daemon has not scheduled yet gets the first slot the daemon itself would give it.
        return claim.NextDueSlot ?? SlotPlanner.FirstSlot(model.Spec.Schedule, now);
    }
}
