using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.Diagnostics.HealthChecks;
using ModelWatch.Store.Configuration;
using Npgsql;

namespace ModelWatch.Daemon.Health;

/// <summary>
/// Readiness detail: every data source under <c>Sources</c> answers. A source that does not is reported as
/// <c>Degraded</c> (HTTP 200 with the reason): the daemon still watches the models of the other sources, and the
/// models of that source report it through their <c>source</c> check.
/// </summary>
public sealed class SourcesHealthCheck(StoreDataSources databases, IConfiguration configuration) : IHealthCheck
{
    /// <summary>The check's registration name.</summary>
    public const string Name = "sources";

    /// <inheritdoc />
    public async Task<HealthCheckResult> CheckHealthAsync(HealthCheckContext context, CancellationToken cancellationToken = default)
    {
        string[] names = [.. configuration.GetSection("Sources").GetChildren().Select(c => c.Key).Order(StringComparer.Ordinal)];
        var data = new Dictionary<string, object>(StringComparer.Ordinal);
        var failing = new List<string>();
        foreach (string name in names)
        {
            try
            {
                await DatabasePing.PingAsync(databases.Source(name), cancellationToken);
                data[name] = "answers";
            }
            catch (Exception ex) when (ex is NpgsqlException or TimeoutException or StoreConfigurationException or InvalidOperationException or ArgumentException or System.Net.Sockets.SocketException)
            {
                data[name] = ex.Message;
                failing.Add(name);
            }
        }

        return failing.Count == 0
            ? HealthCheckResult.Healthy(names.Length == 0 ? "no named sources (models read the state database)" : $"{names.Length} source(s) answer", data)
            : HealthCheckResult.Degraded($"source(s) not answering: {string.Join(", ", failing)}", data: data);
    }
}
