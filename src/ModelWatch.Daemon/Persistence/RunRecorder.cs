using System.Text.Json;
using Dapper;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Runs;
using Npgsql;

namespace ModelWatch.Daemon.Persistence;

/// <summary>
/// Writes a run, its findings, the checks' new states and the alert transitions in one transaction, and only while
/// this worker still holds the model's lease (the fencing update is the first statement; if it touches no row, the
/// transaction is rolled back and nothing is written). The run's (model, slot) key is unique, so a slot that another
/// replica already recorded is never recorded twice: the schedule simply moves on.
/// </summary>
public sealed class RunRecorder(NpgsqlDataSource state, TimeSpan commandTimeout) : IRunMemory
{
    // The fence comes first: if this worker no longer holds a live lease it touches no row, the run insert (fed from
    // it) inserts nothing, and the caller rolls back. A fenced slot that another replica already recorded conflicts on
    // the run's unique (model, slot) key and returns no id.
    private const string FenceAndInsertRunSql = """
        WITH fence AS (
            UPDATE modelwatch.model
               SET next_due_slot = @NextDue, lease_owner = NULL, lease_expires_at = NULL
             WHERE key = @ModelKey AND lease_owner = @Worker AND lease_expires_at > @Now
            RETURNING key
        ), inserted AS (
            INSERT INTO modelwatch.run (model_key, slot, baseline_version, window_start, window_end, rows_read, rows_rejected,
                                        rejected_reasons, status, reason, stage_timings, worker_id, started_at, finished_at)
            SELECT fence.key, @Slot, @BaselineVersion, @WindowStart, @WindowEnd, @RowsRead, @RowsRejected,
                   @RejectedReasons::jsonb, @Status, @Reason, @StageTimings::jsonb, @Worker, @StartedAt, @Now
              FROM fence
            ON CONFLICT (model_key, slot) DO NOTHING
            RETURNING id
        )
        SELECT (SELECT count(*) FROM fence)::int AS Fenced, (SELECT id FROM inserted) AS RunId
        """;

    // Findings, check states and alert-policy states in one statement (arrays unnested server-side): a round trip per
    // row, or even per table, was most of the daemon's per-run overhead. Empty arrays simply write nothing.
    private const string WriteResultsSql = """
        WITH findings AS (
            INSERT INTO modelwatch.finding (run_id, check_name, subject, statistic, value, p_value, threshold, alpha, limit_value, effect_size, severity, explanation, details)
            SELECT @runId, f.check_name, f.subject, f.statistic, f.value, f.p_value, f.threshold, f.alpha, f.limit_value, f.effect_size, f.severity, f.explanation, f.details::jsonb
              FROM unnest(@checks, @subjects, @statistics, @values, @pValues, @thresholds, @alphas, @limits, @effects, @severities, @explanations, @details)
                   AS f(check_name, subject, statistic, value, p_value, threshold, alpha, limit_value, effect_size, severity, explanation, details)
            ON CONFLICT DO NOTHING
        ), check_states AS (
            INSERT INTO modelwatch.check_state (model_key, check_name, subject, state, last_run_id, updated_at)
            SELECT @key, s.check_name, NULL, s.state::jsonb, @runId, @now FROM unnest(@stateChecks, @states) AS s(check_name, state)
            ON CONFLICT (model_key, check_name, subject) DO UPDATE
               SET state = EXCLUDED.state, last_run_id = EXCLUDED.last_run_id, updated_at = EXCLUDED.updated_at
        )
        INSERT INTO modelwatch.alert_policy_state (model_key, check_name, subject, state, updated_at)
        SELECT @key, s.check_name, s.subject, s.state::jsonb, @now FROM unnest(@policyChecks, @policySubjects, @policyStates) AS s(check_name, subject, state)
        ON CONFLICT (model_key, check_name, subject) DO UPDATE SET state = EXCLUDED.state, updated_at = EXCLUDED.updated_at
        """;

    /// <summary>Records a finished run; see the class remarks for the guarantees.</summary>
    public async Task<RecordedRun> RecordAsync(RunOutcome outcome, string worker, DateTimeOffset nextDue, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object? args) => new(sql, args, transaction, Seconds, cancellationToken: cancellationToken);

        (int fenced, long? runId) = await connection.QuerySingleAsync<(int, long?)>(Command(FenceAndInsertRunSql, new
        {
            outcome.ModelKey,
            outcome.Slot,
            outcome.BaselineVersion,
            outcome.WindowStart,
            outcome.WindowEnd,
            outcome.RowsRead,
            outcome.RowsRejected,
            RejectedReasons = JsonSerializer.Serialize(outcome.RejectedReasons),
            Status = outcome.Status.Name(),
            outcome.Reason,
            StageTimings = JsonSerializer.Serialize(outcome.StageSeconds),
            Worker = worker,
            outcome.StartedAt,
            Now = now,
            NextDue = nextDue,
        }));
        if (fenced == 0)
        {
            await transaction.RollbackAsync(cancellationToken);
            return new RecordedRun(null, [], LeaseLost: true, AlreadyRecorded: false);
        }

        if (runId is null)
        {
            await transaction.CommitAsync(cancellationToken);
            return new RecordedRun(null, [], LeaseLost: false, AlreadyRecorded: true);
        }

        List<FindingRow> findings = [.. outcome.Results.SelectMany(r => r.Findings).Select(f => FindingRow.From(runId.Value, f))];
        await connection.ExecuteAsync(Command(WriteResultsSql, new
        {
            runId,
            key = outcome.ModelKey,
            now,
            checks = findings.Select(f => f.Check).ToArray(),
            subjects = findings.Select(f => f.Subject).ToArray(),
            statistics = findings.Select(f => f.Statistic).ToArray(),
            values = findings.Select(f => f.Value).ToArray(),
            pValues = findings.Select(f => f.PValue).ToArray(),
            thresholds = findings.Select(f => f.Threshold).ToArray(),
            alphas = findings.Select(f => f.Alpha).ToArray(),
            limits = findings.Select(f => f.Limit).ToArray(),
            effects = findings.Select(f => f.EffectSize).ToArray(),
            severities = findings.Select(f => f.Severity).ToArray(),
            explanations = findings.Select(f => f.Explanation).ToArray(),
            details = findings.Select(f => f.Details).ToArray(),
            stateChecks = outcome.Results.Select(r => r.Check).ToArray(),
            states = outcome.Results.Select(r => JsonSerializer.Serialize(r.State, StateJson.Options)).ToArray(),
            policyChecks = outcome.Decisions.Select(d => d.Check).ToArray(),
            policySubjects = outcome.Decisions.Select(d => d.Subject).ToArray(),
            policyStates = outcome.Decisions.Select(d => JsonSerializer.Serialize(d.State, StateJson.Options)).ToArray(),
        }));

        var transitions = new List<AlertEvent>();
        foreach (AlertDecision decision in outcome.Decisions.Where(d => d.Action != AlertAction.None))
        {
            AlertEvent? transition = await AlertTransitions.ApplyAsync(connection, transaction, Seconds, outcome.ModelKey, decision, runId.Value, Actors.OfWorker(worker), now, cancellationToken);
            if (transition is not null)
            {
                transitions.Add(transition);
            }
        }

        await transaction.CommitAsync(cancellationToken);
        return new RecordedRun(runId, transitions, LeaseLost: false, AlreadyRecorded: false);
    }

    /// <summary>
    /// The model's persisted check states, alert policy states and the end of its latest window that read rows, in
    /// one round trip.
    /// </summary>
    public async Task<RunRecollection> RecallAsync(string modelKey, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        await using SqlMapper.GridReader grid = await connection.QueryMultipleAsync(new CommandDefinition(
            """
            SELECT check_name, state::text FROM modelwatch.check_state WHERE model_key = @modelKey AND subject IS NULL;
            SELECT state::text FROM modelwatch.alert_policy_state WHERE model_key = @modelKey;
            SELECT max(window_end) FROM modelwatch.run WHERE model_key = @modelKey AND rows_read > 0;
            """,
            new { modelKey }, commandTimeout: Seconds, cancellationToken: cancellationToken));
        var checks = await grid.ReadAsync<(string Check, string State)>();
        var policy = await grid.ReadAsync<string>();
        DateTime? end = await grid.ReadSingleAsync<DateTime?>();
        return new RunRecollection(
            checks.ToDictionary(c => c.Check, c => JsonSerializer.Deserialize<CheckState>(c.State, StateJson.Options)!, StringComparer.Ordinal),
            [.. policy.Select(p => JsonSerializer.Deserialize<AlertPolicyState>(p, StateJson.Options)!)],
            end is { } e ? new DateTimeOffset(DateTime.SpecifyKind(e, DateTimeKind.Utc)) : null);
    }

    private int Seconds => (int)Math.Ceiling(commandTimeout.TotalSeconds);
}
