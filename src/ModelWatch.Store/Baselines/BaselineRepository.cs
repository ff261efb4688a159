using Dapper;
using ModelWatch.Checks.Summaries;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// Versioned baselines in the state database: typed core columns (origin, design, coefficients by term, n,
/// residual SD, condition number) beside the whole <see cref="BaselineReference"/> as a jsonb document, so the
/// checks can add a statistic without a migration. Versions only grow; the current one is the model's active version
/// (<c>modelwatch.model.active_baseline_version</c>) when set, else the newest.
/// </summary>
public sealed class BaselineRepository
{
    private readonly NpgsqlDataSource _state;
    private readonly TimeProvider _time;
    private readonly int _timeoutSeconds;

    /// <summary>Creates the repository over the state database.</summary>
    public BaselineRepository(NpgsqlDataSource state, TimeProvider time, TimeSpan commandTimeout)
    {
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(time);
        _state = state;
        _time = time;
        _timeoutSeconds = (int)Math.Ceiling(commandTimeout.TotalSeconds);
    }

    /// <summary>
    /// Stores <paramref name="reference"/> as the model's next version, makes it the active one and returns that version.
    /// Alerts raised against the previous baseline are left as they are; the daemon's <c>BaselineActivation</c> stores a
    /// baseline and supersedes them in one transaction.
    /// </summary>
    public async Task<int> AddAsync(string modelKey, BaselineReference reference, (DateTimeOffset Start, DateTimeOffset End)? referenceWindow, string createdBy, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        _ = await LockModelAsync(connection, transaction, modelKey, cancellationToken)
            ?? throw new BaselineException($"model {modelKey}: no such model; apply its spec first ('modelwatch model apply')");
        int version = await InsertAsync(connection, transaction, modelKey, reference, referenceWindow, createdBy, cancellationToken);
        await SetActiveAsync(connection, transaction, modelKey, version, cancellationToken);
        await transaction.CommitAsync(cancellationToken);
        return version;
    }

    /// <summary>
    /// Locks the model's row for the rest of <paramref name="transaction"/> (so baseline writers and activations of one
    /// model are serialised and versions never collide) and returns its baseline versions, or null when no model has
    /// that key.
    /// </summary>
    public Task<BaselineVersions?> LockModelAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string modelKey, CancellationToken cancellationToken) =>
        ReadVersionsAsync(connection, transaction, modelKey, " FOR UPDATE", cancellationToken);

    /// <summary>The model's baseline versions and which one is active, or null when no model has that key.</summary>
    public async Task<BaselineVersions?> VersionsAsync(string modelKey, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        BaselineVersions? versions = await ReadVersionsAsync(connection, transaction, modelKey, string.Empty, cancellationToken);
        await transaction.CommitAsync(cancellationToken);
        return versions;
    }

    private async Task<BaselineVersions?> ReadVersionsAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string modelKey, string lockClause, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(connection);
        var model = (await connection.QueryAsync<(string Key, int? Pinned)>(new CommandDefinition(
            "SELECT key, active_baseline_version FROM modelwatch.model WHERE key = @modelKey" + lockClause,
            new { modelKey }, transaction, _timeoutSeconds, cancellationToken: cancellationToken))).ToList();
        if (model.Count == 0)
        {
            return null;
        }

        int[] versions = [.. await connection.QueryAsync<int>(new CommandDefinition(
            "SELECT version FROM modelwatch.baseline WHERE model_key = @modelKey ORDER BY version",
            new { modelKey }, transaction, _timeoutSeconds, cancellationToken: cancellationToken))];
        return new BaselineVersions(versions, model[0].Pinned);
    }

    /// <summary>Inserts the model's next version inside <paramref name="transaction"/>, whose caller holds the model's lock.</summary>
    public async Task<int> InsertAsync(
        NpgsqlConnection connection, NpgsqlTransaction transaction, string modelKey, BaselineReference reference, (DateTimeOffset Start, DateTimeOffset End)? referenceWindow, string createdBy, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(connection);
        ArgumentNullException.ThrowIfNull(reference);
        ArgumentException.ThrowIfNullOrWhiteSpace(createdBy);
        var layout = reference.ToLayout();
        CommandDefinition Command(string sql, object? args) => new(sql, args, transaction, _timeoutSeconds, cancellationToken: cancellationToken);
        int version = await connection.ExecuteScalarAsync<int>(Command(
            "SELECT COALESCE(MAX(version), 0) + 1 FROM modelwatch.baseline WHERE model_key = @modelKey", new { modelKey }));
        await connection.ExecuteAsync(Command(
            """
            INSERT INTO modelwatch.baseline (model_key, version, origin, design_signature, outcome, features, intercept, terms, coefficients,
                row_count, residual_sd, residual_df, condition_number, reference_window_start, reference_window_end,
                reference, reference_schema, created_at, created_by)
            VALUES (@modelKey, @version, @Origin, @Design, @Outcome, @Features, @Intercept, @Terms, @Coefficients,
                @RowCount, @ResidualSd, @ResidualDf, @ConditionNumber, @WindowStart, @WindowEnd,
                CAST(@Reference AS jsonb), @Schema, @CreatedAt, @createdBy)
            """,
            new
            {
                modelKey,
                version,
                Origin = reference.Origin == BaselineOrigin.Fitted ? "fitted" : "imported",
                Design = ModelSpec.SignatureOf(layout),
                reference.Outcome,
                Features = reference.Features.ToArray(),
                reference.Intercept,
                Terms = layout.Terms.ToArray(),
                Coefficients = reference.CoefficientVector(),
                reference.RowCount,
                ResidualSd = Finite(reference.ResidualStandardDeviation),
                ResidualDf = reference.ResidualDegreesOfFreedom,
                ConditionNumber = reference.ConditionNumber is { } c ? Finite(c) : null,
                WindowStart = referenceWindow?.Start.UtcDateTime,
                WindowEnd = referenceWindow?.End.UtcDateTime,
                Reference = BaselineJson.Serialize(reference),
                Schema = reference.SchemaVersion,
                CreatedAt = _time.GetUtcNow().UtcDateTime,
                createdBy,
            }));
        return version;
    }

    /// <summary>Makes <paramref name="version"/> the one the model is watched against, inside <paramref name="transaction"/>.</summary>
    public async Task SetActiveAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string modelKey, int version, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(connection);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE modelwatch.model SET active_baseline_version = @version, updated_at = @now WHERE key = @modelKey",
            new { modelKey, version, now = _time.GetUtcNow().UtcDateTime }, transaction, _timeoutSeconds, cancellationToken: cancellationToken));
    }

    /// <summary>
    /// The baseline the model is watched against: the active version when one is set, else the newest; null when the
    /// model has none.
    /// </summary>
    public async Task<StoredBaseline?> GetCurrentAsync(string modelKey, CancellationToken cancellationToken) =>
        FirstOrNull(await QueryAsync(
            """
            WHERE model_key = @modelKey
              AND version = COALESCE((SELECT active_baseline_version FROM modelwatch.model WHERE key = @modelKey),
                                     (SELECT max(version) FROM modelwatch.baseline WHERE model_key = @modelKey))
            """,
            new { modelKey },
            cancellationToken));

    /// <summary>One version of the model's baseline, or null.</summary>
    public async Task<StoredBaseline?> GetAsync(string modelKey, int version, CancellationToken cancellationToken) =>
        FirstOrNull(await QueryAsync("WHERE model_key = @modelKey AND version = @version", new { modelKey, version }, cancellationToken));

    /// <summary>Every version of the model's baseline, oldest first.</summary>
    public Task<IReadOnlyList<StoredBaseline>> ListAsync(string modelKey, CancellationToken cancellationToken) =>
        QueryAsync("WHERE model_key = @modelKey ORDER BY version", new { modelKey }, cancellationToken);

    private async Task<IReadOnlyList<StoredBaseline>> QueryAsync(string where, object args, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        IEnumerable<BaselineRow> rows = await connection.QueryAsync<BaselineRow>(new CommandDefinition(
            """
            SELECT model_key AS ModelKey, version AS Version, design_signature AS DesignSignature,
                   reference_window_start AS WindowStart, reference_window_end AS WindowEnd,
                   created_at AS CreatedAt, created_by AS CreatedBy, reference::text AS ReferenceJson
            FROM modelwatch.baseline
            """ + " " + where,
            args, null, _timeoutSeconds, cancellationToken: cancellationToken));
        return [.. rows.Select(r => r.ToStored())];
    }

    private static StoredBaseline? FirstOrNull(IReadOnlyList<StoredBaseline> rows) => rows.Count == 0 ? null : rows[0];

    private static double? Finite(double value) => double.IsFinite(value) ? value : null;
}
