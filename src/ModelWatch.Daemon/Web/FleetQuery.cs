using Dapper;
using Npgsql;

namespace ModelWatch.Daemon.Web;

/// <summary>Reads one <see cref="FleetRow"/> per registered model, in key order, in one statement.</summary>
internal sealed class FleetQuery(NpgsqlDataSource state, TimeSpan commandTimeout)
{
    private const string Sql = """
        SELECT m.key AS Key, m.enabled AS Enabled, last.slot AS LastRunSlot, last.status AS LastRunStatus,
               (SELECT CASE max(CASE f.severity WHEN 'critical' THEN 2 WHEN 'warning' THEN 1 ELSE 0 END)
                       WHEN 2 THEN 'critical' WHEN 1 THEN 'warning' WHEN 0 THEN 'ok' END
                  FROM modelwatch.finding f WHERE f.run_id = last.id) AS WorstSeverity,
               (SELECT count(*) FROM modelwatch.alert a WHERE a.model_key = m.key AND a.state <> 'resolved' AND a.severity = 'critical')::int AS OpenCritical,
               (SELECT count(*) FROM modelwatch.alert a WHERE a.model_key = m.key AND a.state <> 'resolved' AND a.severity = 'warning')::int AS OpenWarning,
               (SELECT max(q.until) FROM modelwatch.quiet_period q
                 WHERE q.model_key = m.key AND q.check_name IS NULL AND q.ended_at IS NULL AND q.until > now()) AS QuietUntil,
               b.version AS BaselineVersion, b.created_at AS BaselineCreatedAt,
               (SELECT count(*) FROM modelwatch.run r
                 WHERE r.model_key = m.key AND r.status = 'failed'
                   AND r.slot > COALESCE((SELECT max(o.slot) FROM modelwatch.run o WHERE o.model_key = m.key AND o.status IN ('ok', 'skipped')), '-infinity'))::int AS ConsecutiveFailedRuns
          FROM modelwatch.model m
          LEFT JOIN LATERAL (SELECT r.id, r.slot, r.status FROM modelwatch.run r
                              WHERE r.model_key = m.key AND r.status <> 'running' ORDER BY r.slot DESC, r.id DESC LIMIT 1) last ON true
          LEFT JOIN LATERAL (SELECT version, created_at FROM modelwatch.baseline
                              WHERE model_key = m.key AND (m.active_baseline_version IS NULL OR version = m.active_baseline_version)
                              ORDER BY version DESC LIMIT 1) b ON true
         ORDER BY m.key
        """;

    public async Task<IReadOnlyList<FleetRow>> ReadAsync(CancellationToken cancellationToken)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
        return [.. await connection.QueryAsync<FleetRow>(new CommandDefinition(Sql, commandTimeout: (int)Math.Ceiling(commandTimeout.TotalSeconds), cancellationToken: cancellationToken))];
    }
}
