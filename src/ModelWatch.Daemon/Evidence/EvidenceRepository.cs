using System.Text.Json;
using Dapper;
using ModelWatch.Daemon.Persistence;
using Npgsql;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The state-database reads behind the evidence report and the web pages: an alert's evidence run, a run's model, and
/// a model's recent runs with their findings. Alerts and runs have separate id sequences, so every read says which
/// kind of id it takes.
/// </summary>
internal sealed class EvidenceRepository(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    /// <summary>How many of the model's runs a history covers.</summary>
    public const int HistoryRuns = 200;

    private readonly int _timeoutSeconds = (int)Math.Ceiling(commandTimeout.TotalSeconds);

    /// <summary>
    /// The alert's latest critical run at or before its last run (for a resolved alert, the run that resolved it is quiet,
    /// so it is not the evidence); null when the alert's runs are pruned.
    /// </summary>
    public async Task<long?> EvidenceRunOfAlertAsync(string model, string check, string? subject, long? lastRunId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<long?>(Command(
            """
            SELECT f.run_id FROM modelwatch.finding f JOIN modelwatch.run r ON r.id = f.run_id
             WHERE r.model_key = @model AND f.check_name = @check AND f.subject IS NOT DISTINCT FROM @subject AND f.severity = 'critical'
               AND r.slot <= COALESCE((SELECT slot FROM modelwatch.run WHERE id = @last), 'infinity')
             ORDER BY r.slot DESC LIMIT 1
            """,
            new { model, check, subject, last = lastRunId },
            cancellationToken));
    }

    /// <summary>The model of a run, or null when no run has the id.</summary>
    public async Task<string?> ModelOfRunAsync(long runId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<string?>(Command("SELECT model_key FROM modelwatch.run WHERE id = @runId", new { runId }, cancellationToken));
    }

    /// <summary>
    /// The model's newest runs with their findings, oldest first; when <paramref name="focusRunId"/> is older than all of
    /// them, the runs leading up to it instead.
    /// </summary>
    public async Task<IReadOnlyList<EvidenceRun>> RunsAsync(string model, long? focusRunId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        const string Select = """
            SELECT id AS Id, slot AS Slot, window_start AS WindowStart, window_end AS WindowEnd, status AS Status, reason AS Reason,
                   baseline_version AS BaselineVersion, rows_read AS RowsRead
              FROM modelwatch.run
             WHERE model_key = @model AND (@until::timestamptz IS NULL OR slot <= @until)
             ORDER BY slot DESC, id DESC
             LIMIT @limit
            """;
        List<RunView> runs = [.. await connection.QueryAsync<RunView>(Command(Select, new { model, until = (DateTime?)null, limit = HistoryRuns }, cancellationToken))];
        if (focusRunId is { } fid && runs.All(r => r.Id != fid))
        {
            DateTime? until = await connection.QuerySingleOrDefaultAsync<DateTime?>(Command("SELECT slot FROM modelwatch.run WHERE id = @fid", new { fid }, cancellationToken));
            if (until is not null)
            {
                runs = [.. await connection.QueryAsync<RunView>(Command(Select, new { model, until, limit = HistoryRuns }, cancellationToken))];
            }
        }

        long[] ids = [.. runs.Select(r => r.Id)];
        IEnumerable<FindingView> findings = await connection.QueryAsync<FindingView>(Command(
            $"SELECT {FindingView.Columns} FROM modelwatch.finding WHERE run_id = ANY(@ids) ORDER BY id", new { ids }, cancellationToken));
        ILookup<long, EvidenceFinding> byRun = findings.Select(ToFinding).ToLookup(f => f.RunId);
        return [.. runs.OrderBy(r => r.Slot).ThenBy(r => r.Id).Select(r => new EvidenceRun(
            r.Id, Utc(r.Slot), r.WindowStart is { } s ? Utc(s) : null, r.WindowEnd is { } e ? Utc(e) : null,
            r.Status, r.Reason, r.BaselineVersion, r.RowsRead, [.. byRun[r.Id]]))];
    }

    private static EvidenceFinding ToFinding(FindingView row)
    {
        var details = new Dictionary<string, double>(StringComparer.Ordinal);
        using (JsonDocument document = JsonDocument.Parse(row.Details))
        {
            foreach (JsonProperty property in document.RootElement.EnumerateObject().Where(p => p.Value.ValueKind == JsonValueKind.Number))
            {
                details[property.Name] = property.Value.GetDouble();
            }
        }

        return new EvidenceFinding(row.RunId, row.Check, row.Subject, row.Statistic, row.Value, row.PValue, row.Threshold, row.EffectSize,
            row.Severity, row.Explanation, details, row.SkipReason);
    }

    private static DateTimeOffset Utc(DateTime value) => new(DateTime.SpecifyKind(value, DateTimeKind.Utc));

    private CommandDefinition Command(string sql, object args, CancellationToken cancellationToken) =>
        new(sql, args, commandTimeout: _timeoutSeconds, cancellationToken: cancellationToken);
}
