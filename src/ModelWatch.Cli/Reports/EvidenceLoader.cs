using System.Text.Json;
using Dapper;
using ModelWatch.Checks.Summaries;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Windows;
using Npgsql;

namespace ModelWatch.Cli.Reports;

/// <summary>
/// Loads the evidence of an alert or a run: run and alert ids come from one sequence (migration 0002), so an id names
/// at most one of them.
/// </summary>
internal sealed class EvidenceLoader(StoreDataSources databases, TimeSpan commandTimeout)
{
    /// <summary>How many of the model's runs the history covers.</summary>
    public const int HistoryRuns = 200;

    private readonly int _timeoutSeconds = (int)Math.Ceiling(commandTimeout.TotalSeconds);

    /// <summary>The evidence, or null when no alert or run has the id.</summary>
    /// <param name="id">An alert id or a run id.</param>
    /// <param name="readWindow">Re-read the focus window from the data source for the residual distribution.</param>
    /// <param name="cancellationToken">Cancels the reads.</param>
    public async Task<Evidence?> LoadAsync(long id, bool readWindow, CancellationToken cancellationToken)
    {
        NpgsqlDataSource state = databases.State;
        var alerts = new AlertRepository(state, commandTimeout);
        AlertView? alert = await alerts.GetAsync(id, cancellationToken);
        string? model;
        long? focusId;
        if (alert is not null)
        {
            model = alert.Model;

            // The evidence is the alert's latest critical run: for a resolved alert, the run that resolved it is quiet.
            await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
            focusId = await connection.QuerySingleOrDefaultAsync<long?>(Command(
                """
                SELECT f.run_id FROM modelwatch.finding f JOIN modelwatch.run r ON r.id = f.run_id
                 WHERE r.model_key = @model AND f.check_name = @check AND f.subject IS NOT DISTINCT FROM @subject AND f.severity = 'critical'
                   AND r.slot <= COALESCE((SELECT slot FROM modelwatch.run WHERE id = @last), 'infinity')
                 ORDER BY r.slot DESC LIMIT 1
                """,
                new { model, check = alert.Check, subject = alert.Subject, last = alert.LastRunId },
                cancellationToken)) ?? alert.LastRunId ?? alert.FirstRunId;
        }
        else
        {
            await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
            model = await connection.QuerySingleOrDefaultAsync<string?>(Command("SELECT model_key FROM modelwatch.run WHERE id = @id", new { id }, cancellationToken));
            focusId = id;
            if (model is null)
            {
                return null;
            }
        }

        IReadOnlyList<EvidenceRun> runs = await RunsAsync(model, focusId, cancellationToken);
        EvidenceRun? focus = runs.FirstOrDefault(r => r.Id == focusId);
        var baselines = new BaselineRepository(state, TimeProvider.System, commandTimeout);
        StoredBaseline? baseline = focus?.BaselineVersion is { } version
            ? await baselines.GetAsync(model, version, cancellationToken)
            : await baselines.GetCurrentAsync(model, cancellationToken);
        var evidence = new Evidence
        {
            Id = id,
            Model = model,
            Alert = alert,
            History = alert is null ? [] : await alerts.HistoryAsync(id, cancellationToken),
            Focus = focus,
            Runs = runs,
            Baseline = baseline,
        };
        return readWindow ? await WithWindowResidualsAsync(evidence, cancellationToken) : evidence;
    }

    private async Task<IReadOnlyList<EvidenceRun>> RunsAsync(string model, long? focusId, CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await databases.State.OpenConnectionAsync(cancellationToken);

        // The newest runs, unless the focus run is older than they are: then the runs leading up to it.
        const string Select = """
            SELECT id AS Id, slot AS Slot, window_start AS WindowStart, window_end AS WindowEnd, status AS Status, reason AS Reason,
                   baseline_version AS BaselineVersion, rows_read AS RowsRead
              FROM modelwatch.run
             WHERE model_key = @model AND (@until::timestamptz IS NULL OR slot <= @until)
             ORDER BY slot DESC, id DESC
             LIMIT @limit
            """;
        List<RunView> runs = [.. await connection.QueryAsync<RunView>(Command(Select, new { model, until = (DateTime?)null, limit = HistoryRuns }, cancellationToken))];
        if (focusId is { } fid && runs.All(r => r.Id != fid))
        {
            DateTime? until = await connection.QuerySingleOrDefaultAsync<DateTime?>(Command("SELECT slot FROM modelwatch.run WHERE id = @fid", new { fid }, cancellationToken));
            if (until is not null)
            {
                runs = [.. await connection.QueryAsync<RunView>(Command(Select, new { model, until, limit = HistoryRuns }, cancellationToken))];
            }
        }

        long[] ids = [.. runs.Select(r => r.Id)];
        IEnumerable<EvidenceFindingRow> findings = await connection.QueryAsync<EvidenceFindingRow>(Command(
            """
            SELECT run_id AS RunId, check_name AS Check, subject AS Subject, statistic AS Statistic, value AS Value, p_value AS PValue,
                   threshold AS Threshold, effect_size AS EffectSize, severity AS Severity, explanation AS Explanation, details::text AS Details
              FROM modelwatch.finding
             WHERE run_id = ANY(@ids)
             ORDER BY id
            """, new { ids }, cancellationToken));
        ILookup<long, EvidenceFinding> byRun = findings.Select(ToFinding).ToLookup(f => f.RunId);
        return [.. runs.OrderBy(r => r.Slot).ThenBy(r => r.Id).Select(r => new EvidenceRun(
            r.Id, Utc(r.Slot), r.WindowStart is { } s ? Utc(s) : null, r.WindowEnd is { } e ? Utc(e) : null,
            r.Status, r.Reason, r.BaselineVersion, r.RowsRead, [.. byRun[r.Id]]))];
    }

    private async Task<Evidence> WithWindowResidualsAsync(Evidence evidence, CancellationToken cancellationToken)
    {
        if (evidence.Focus is not { WindowStart: { } start, WindowEnd: { } end } || evidence.Baseline is null)
        {
            return evidence with { WindowResidualsProblem = "the run has no window or no baseline" };
        }

        try
        {
            ModelRecord? record = await new ModelRepository(databases.State, TimeProvider.System, commandTimeout).GetAsync(evidence.Model, cancellationToken);
            if (record is null)
            {
                return evidence with { WindowResidualsProblem = "the model is no longer registered" };
            }

            BaselineReference reference = evidence.Baseline.Reference;
            var read = await new WindowReader(databases.ReadOptions()).ReadAsync(
                databases.Source(record.Spec.Source), record.Spec, start, end,
                () => new WindowSummarySink(record.Spec.Layout, reference, new WindowSummaryOptions()), WindowSummarySink.Merge, cancellationToken);
            double[] sample = read.Sink.Builder.Build().ResidualSample;
            return sample.Length == 0
                ? evidence with { WindowResidualsProblem = "the window has no usable rows now" }
                : evidence with { WindowResiduals = sample };
        }
        catch (Exception ex) when (ex is WindowReadException or NpgsqlException or StoreConfigurationException or ArgumentException or InvalidOperationException)
        {
            // The chart is optional evidence: a source that is gone or changed must not stop the report.
            return evidence with { WindowResidualsProblem = "the window could not be re-read: " + ex.Message };
        }
    }

    private static EvidenceFinding ToFinding(EvidenceFindingRow row)
    {
        var details = new Dictionary<string, double>(StringComparer.Ordinal);
        string? skipped = null;
        using (JsonDocument document = JsonDocument.Parse(row.Details))
        {
            foreach (JsonProperty property in document.RootElement.EnumerateObject())
            {
                if (property.Value.ValueKind == JsonValueKind.Number)
                {
                    details[property.Name] = property.Value.GetDouble();
                }
                else if (property.Name == "skipped" && property.Value.ValueKind == JsonValueKind.String)
                {
                    skipped = property.Value.GetString();
                }
            }
        }

        return new EvidenceFinding(row.RunId, row.Check, row.Subject, row.Statistic, row.Value, row.PValue, row.Threshold, row.EffectSize,
            row.Severity, row.Explanation, details, skipped);
    }

    private static DateTimeOffset Utc(DateTime value) => new(DateTime.SpecifyKind(value, DateTimeKind.Utc));

    private CommandDefinition Command(string sql, object args, CancellationToken cancellationToken) =>
        new(sql, args, commandTimeout: _timeoutSeconds, cancellationToken: cancellationToken);
}
