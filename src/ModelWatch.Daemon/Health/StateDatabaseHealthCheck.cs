using Microsoft.Extensions.Diagnostics.HealthChecks;
using Npgsql;

namespace ModelWatch.Daemon.Health;

/// <summary>
/// Readiness: the state database answers now and the loop found its schema current at its latest cycle. Unhealthy
/// (HTTP 503) otherwise: the daemon cannot claim or record anything.
/// </summary>
public sealed class StateDatabaseHealthCheck(NpgsqlDataSource state, DaemonHealth health) : IHealthCheck
{
    /// <summary>The check's registration name.</summary>
    public const string Name = "state_database";

    /// <inheritdoc />
    public async Task<HealthCheckResult> CheckHealthAsync(HealthCheckContext context, CancellationToken cancellationToken = default)
    {
        try
        {
            await DatabasePing.PingAsync(state, cancellationToken);
        }
        catch (Exception ex) when (ex is NpgsqlException or TimeoutException or InvalidOperationException or System.Net.Sockets.SocketException)
        {
            return HealthCheckResult.Unhealthy("the state database does not answer: " + ex.Message);
        }

        return health.DatabaseReady
            ? HealthCheckResult.Healthy("the state database answers and its schema is current")
            : HealthCheckResult.Unhealthy("the state database answers but the loop could not use it: " + health.DatabaseProblem);
    }
}
