using Dapper;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Models;

/// <summary>The model registry in the state database: apply (upsert) specs, list them, read one.</summary>
public sealed class ModelRepository
{
    private const string SelectModels = """
        SELECT m.key AS Key, m.spec::text AS SpecJson, m.enabled AS Enabled, m.next_due_slot AS NextDueSlot,
               m.lease_owner AS LeaseOwner, m.lease_expires_at AS LeaseExpiresAt, m.source_file AS SourceFile,
               m.created_at AS CreatedAt, m.updated_at AS UpdatedAt,
               b.version AS BaselineVersion, b.design_signature AS BaselineDesignSignature
        FROM modelwatch.model m
        LEFT JOIN LATERAL (SELECT version, design_signature FROM modelwatch.baseline
                           WHERE model_key = m.key AND (m.active_baseline_version IS NULL OR version = m.active_baseline_version)
                           ORDER BY version DESC LIMIT 1) b ON true
        """;

    private readonly NpgsqlDataSource _state;
    private readonly int _timeoutSeconds;
    private readonly TimeProvider _time;

    /// <summary>Creates the repository over the state database.</summary>
    public ModelRepository(NpgsqlDataSource state, TimeProvider time, TimeSpan commandTimeout)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(time);
        _state = state;
        _time = time;
        _timeoutSeconds = (int)Math.Ceiling(commandTimeout.TotalSeconds);
    }

    /// <summary>
    /// Upserts every spec in one transaction (all or nothing). With <paramref name="prune"/>, enabled models
    /// whose key is not among <paramref name="specs"/> are disabled, never deleted, so their history stays.
    /// </summary>
    public async Task<IReadOnlyList<ApplyOutcome>> ApplyAsync(IReadOnlyList<(ModelSpec Spec, string? File)> specs, bool prune, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(specs);
        var outcomes = new List<ApplyOutcome>();
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object? args = null) => new(sql, args, transaction, _timeoutSeconds, cancellationToken: cancellationToken);

        DateTimeOffset now = _time.GetUtcNow();
        foreach ((ModelSpec spec, string? file) in specs)
        {
            var existing = (await connection.QueryAsync<(string Sha, bool Enabled)>(Command(
                "SELECT spec_sha256, enabled FROM modelwatch.model WHERE key = @key FOR UPDATE", new { key = spec.Key }))).ToList();
            DateTime? nextDue = spec.Schedule.NextSlotAfter(now)?.UtcDateTime;
            string sha = spec.Sha256();
            ApplyAction action;
            if (existing.Count == 0)
            {
                await connection.ExecuteAsync(Command(
                    """
                    INSERT INTO modelwatch.model (key, spec, spec_sha256, design_signature, source, enabled, schedule, next_due_slot, source_file, created_at, updated_at)
                    VALUES (@Key, CAST(@Spec AS jsonb), @Sha, @Design, @Source, @Enabled, @Schedule, @NextDue, @File, @Now, @Now)
                    """,
                    new { spec.Key, Spec = spec.ToJson(), Sha = sha, Design = spec.DesignSignature, spec.Source, spec.Enabled, Schedule = spec.Schedule.Text, NextDue = nextDue, File = file, Now = now.UtcDateTime }));
                action = ApplyAction.Created;
            }
            else if (existing[0].Sha == sha && existing[0].Enabled == spec.Enabled)
            {
                action = ApplyAction.Unchanged;
            }
            else
            {
                // A changed schedule starts from the next slot of the new schedule; otherwise the due slot stands.
                await connection.ExecuteAsync(Command(
                    """
                    UPDATE modelwatch.model SET spec = CAST(@Spec AS jsonb), spec_sha256 = @Sha, design_signature = @Design, source = @Source,
                        enabled = @Enabled, schedule = @Schedule, source_file = @File, updated_at = @Now,
                        next_due_slot = CASE WHEN schedule = @Schedule AND next_due_slot IS NOT NULL THEN next_due_slot ELSE @NextDue END
                    WHERE key = @Key
                    """,
                    new { spec.Key, Spec = spec.ToJson(), Sha = sha, Design = spec.DesignSignature, spec.Source, spec.Enabled, Schedule = spec.Schedule.Text, NextDue = nextDue, File = file, Now = now.UtcDateTime }));
                action = ApplyAction.Updated;
            }

            string? baselineDesign = await connection.QuerySingleOrDefaultAsync<string?>(Command(
                """
                SELECT b.design_signature FROM modelwatch.baseline b JOIN modelwatch.model m ON m.key = b.model_key
                 WHERE b.model_key = @key AND (m.active_baseline_version IS NULL OR b.version = m.active_baseline_version)
                 ORDER BY b.version DESC LIMIT 1
                """, new { key = spec.Key }));
            string? note = baselineDesign is null
                ? "no baseline yet; runs are skipped until one is fitted or imported"
                : baselineDesign != spec.DesignSignature
                    ? $"the current baseline was made for '{baselineDesign}', the spec now says '{spec.DesignSignature}'; runs are skipped until a new baseline exists"
                    : null;
            outcomes.Add(new ApplyOutcome(spec.Key, action, note));
        }

        if (prune)
        {
            string[] keep = [.. specs.Select(s => s.Spec.Key)];
            IEnumerable<string> disabled = await connection.QueryAsync<string>(Command(
                "UPDATE modelwatch.model SET enabled = false, updated_at = @now WHERE enabled AND NOT (key = ANY(@keep)) RETURNING key",
                new { keep, now = now.UtcDateTime }));
            outcomes.AddRange(disabled.Order(StringComparer.Ordinal).Select(k => new ApplyOutcome(k, ApplyAction.Disabled, null)));
        }

        await transaction.CommitAsync(cancellationToken);
        return outcomes;
    }

    /// <summary>Every registered model, by key.</summary>
    public async Task<IReadOnlyList<ModelRecord>> ListAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        IEnumerable<ModelRow> rows = await connection.QueryAsync<ModelRow>(new CommandDefinition(
            SelectModels + " ORDER BY m.key", null, null, _timeoutSeconds, cancellationToken: cancellationToken));
        return [.. rows.Select(r => r.ToRecord())];
    }

    /// <summary>One model, or null when no model has that key.</summary>
    public async Task<ModelRecord?> GetAsync(string key, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        ModelRow? row = await connection.QuerySingleOrDefaultAsync<ModelRow>(new CommandDefinition(
            SelectModels + " WHERE m.key = @key", new { key }, null, _timeoutSeconds, cancellationToken: cancellationToken));
        return row?.ToRecord();
    }
}
