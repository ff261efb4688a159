using Dapper;
using ModelWatch.Checks.Summaries;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// Versioned baselines in the state database: typed core columns (origin, design, coefficients by term, n,
/// residual SD, condition number) beside the whole <see cref="BaselineReference"/> as a jsonb document, so the
/// checks can add a statistic without a migration. Versions only grow; the newest is the current one.
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

    /// <summary>Stores <paramref name="reference"/> as the model's next version and returns that version.</summary>
    public async Task<int> AddAsync(string modelKey, BaselineReference reference, (DateTimeOffset Start, DateTimeOffset End)? referenceWindow, string createdBy, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(reference);
        ArgumentException.ThrowIfNullOrWhiteSpace(createdBy);
        var layout = reference.ToLayout();
        await using NpgsqlConnection connection = await _state.OpenConnectionAsync(cancellationToken);
        await using NpgsqlTransaction transaction = await connection.BeginTransactionAsync(cancellationToken);
        CommandDefinition Command(string sql, object? args) => new(sql, args, transaction, _timeoutSeconds, cancellationToken: cancellationToken);

        // Locking the model row serialises concurrent baseline writers of one model, so versions never collide.
        bool exists = (await connection.QueryAsync<string>(Command("SELECT key FROM modelwatch.model WHERE key = @modelKey FOR UPDATE", new { modelKey }))).Any();
        if (!exists)
        {
            throw new BaselineException($"model {modelKey}: no such model; apply its spec first ('modelwatch model apply')");
        }

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
        await transaction.CommitAsync(cancellationToken);
        return version;
    }

    /// <summary>The model's newest baseline, or null when it has none.</summary>
    public async Task<StoredBaseline?> GetCurrentAsync(string modelKey, CancellationToken cancellationToken) =>
        FirstOrNull(await QueryAsync("WHERE model_key = @modelKey ORDER BY version DESC LIMIT 1", new { modelKey }, cancellationToken));

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
