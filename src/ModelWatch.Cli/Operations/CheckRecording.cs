using Dapper;
using ModelWatch.Cli.Commands;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Store.Models;
using Npgsql;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// <c>check --record</c>: runs and records one slot the way a daemon replica does — claim the model's lease, run
/// the pipeline with the memory kept in the state database, record under the lease — except that the model's next
/// due slot is left as it was, so the daemon's schedule does not move. The unique (model, slot) key means a slot
/// that is already recorded is never recorded twice.
/// </summary>
internal static class CheckRecording
{
    private const string ClaimSql = """
        UPDATE modelwatch.model
           SET lease_owner = @worker, lease_expires_at = @expires
         WHERE key = @key
           AND (lease_owner IS NULL OR lease_owner = @worker OR lease_expires_at IS NULL OR lease_expires_at <= @now)
        RETURNING next_due_slot
        """;

    /// <summary>The lease owner of commands run by a person: <c>cli:&lt;user&gt;</c>.</summary>
    public static string Worker => "cli:" + Environment.UserName;

    /// <summary>Runs and records the slot; returns the outcome and a line that says what was written.</summary>
    public static async Task<(RunOutcome Outcome, string Note)> RunAsync(OperationServices services, ModelRecord model, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        string worker = Worker;
        DateTimeOffset claimedAt = services.Time.GetUtcNow();
        DateTimeOffset nextDue = await ClaimAsync(services.State, model, worker, claimedAt, services.LeaseDuration, cancellationToken);
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

    private static async Task<DateTimeOffset> ClaimAsync(NpgsqlDataSource state, ModelRecord model, string worker, DateTimeOffset now, TimeSpan lease, CancellationToken cancellationToken)
    {
        int seconds = (int)Math.Ceiling(StoreCommandRunner.CommandTimeout.TotalSeconds);
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var claimed = (await connection.QueryAsync<DateTime?>(new CommandDefinition(
            ClaimSql,
            new { key = model.Key, worker, now, expires = now + lease },
            commandTimeout: seconds,
            cancellationToken: cancellationToken))).ToList();
        if (claimed.Count == 0)
        {
            var holder = await connection.QuerySingleOrDefaultAsync<(string? Owner, DateTime? Until)>(new CommandDefinition(
                "SELECT lease_owner, lease_expires_at FROM modelwatch.model WHERE key = @key",
                new { key = model.Key },
                commandTimeout: seconds,
                cancellationToken: cancellationToken));
            throw new OperationException($"model {model.Key}: {holder.Owner ?? "another worker"} holds the lease until {CliJson.Time(holder.Until) ?? "?"} (it is running the model now); try again after that");
        }

        // A model the daemon has not scheduled yet gets the first slot the daemon itself would give it.
        return claimed[0] is { } due
            ? new DateTimeOffset(DateTime.SpecifyKind(due, DateTimeKind.Utc))
            : SlotPlanner.FirstSlot(model.Spec.Schedule, now);
    }
}
