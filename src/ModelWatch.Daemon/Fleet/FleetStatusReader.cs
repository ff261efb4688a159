using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Fleet;

/// <summary>
/// The fleet at a glance: one row per registered model with its newest run, open alerts, quiet periods, baseline and
/// failing streak, read in one statement (index probes per model: the newest run by slot, unresolved alerts by model).
/// </summary>
public sealed class FleetStatusReader(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    private const string FleetSql = """
        SELECT m.key AS Key, m.enabled AS Enabled,
               last.slot AS LastRunAt, last.status AS LastStatus,
               (SELECT CASE max(CASE f.severity WHEN 'critical' THEN 2 WHEN 'warning' THEN 1 ELSE 0 END)
                           WHEN 2 THEN 'critical' WHEN 1 THEN 'warning' WHEN 0 THEN 'ok' END
                  FROM modelwatch.finding f WHERE f.run_id = last.id) AS WorstSeverity,
               COALESCE(alerts.warning, 0) AS OpenWarning, COALESCE(alerts.critical, 0) AS OpenCritical,
               quiet.until AS QuietUntil, COALESCE(quiet.count, 0) AS QuietPeriods,
               b.version AS BaselineVersion, b.created_at AS BaselineCreatedAt,
               (SELECT count(*) FROM modelwatch.run r
                 WHERE r.model_key = m.key AND r.status = 'failed'
                   AND r.slot > COALESCE((SELECT max(s.slot) FROM modelwatch.run s WHERE s.model_key = m.key AND s.status IN ('ok', 'skipped')), '-infinity'))::int AS FailingRuns
          FROM modelwatch.model m
          LEFT JOIN LATERAL (SELECT r.id, r.slot, r.status FROM modelwatch.run r
                              WHERE r.model_key = m.key AND r.status <> 'running'
                              ORDER BY r.slot DESC LIMIT 1) last ON true
          LEFT JOIN LATERAL (SELECT count(*) FILTER (WHERE a.severity = 'warning')::int AS warning,
                                    count(*) FILTER (WHERE a.severity = 'critical')::int AS critical
                               FROM modelwatch.alert a WHERE a.model_key = m.key AND a.state <> 'resolved') alerts ON true
          LEFT JOIN LATERAL (SELECT max(q.until) AS until, count(*)::int AS count FROM modelwatch.quiet_period q
                              WHERE q.model_key = m.key AND q.ended_at IS NULL AND q.until > @now) quiet ON true
          LEFT JOIN LATERAL (SELECT v.version, v.created_at FROM modelwatch.baseline v
                              WHERE v.model_key = m.key AND (m.active_baseline_version IS NULL OR v.version = m.active_baseline_version)
                              ORDER BY v.version DESC LIMIT 1) b ON true
         WHERE (@key::text IS NULL OR m.key = @key)
         ORDER BY m.key
        """;

    /// <summary>Every registered model (or only <paramref name="key"/>), by key.</summary>
    public async Task<IReadOnlyList<ModelStatus>> ReadAsync(DateTimeOffset now, CancellationToken cancellationToken, string? key = null)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        var rows = await connection.QueryAsync<ModelStatus>(new CommandDefinition(
            FleetSql, new { now, key }, commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds), cancellationToken: cancellationToken));
        return rows.ToList();
    }
}
