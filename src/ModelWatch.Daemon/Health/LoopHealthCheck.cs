using Microsoft.Extensions.Diagnostics.HealthChecks;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Health;

/// <summary>Liveness: the scheduling loop completed a cycle within <see cref="HttpOptions.LivenessPollIntervals"/> poll intervals.</summary>
public sealed class LoopHealthCheck(DaemonHealth health, IOptions<DaemonOptions> daemon, IOptions<HttpOptions> http) : IHealthCheck
{
    /// <summary>The check's registration name.</summary>
    public const string Name = "loop";

    /// <inheritdoc />
    public Task<HealthCheckResult> CheckHealthAsync(HealthCheckContext context, CancellationToken cancellationToken = default)
    {
        TimeSpan allowance = daemon.Value.PollInterval * http.Value.LivenessPollIntervals;
        string last = health.LastCycle.ToString("yyyy-MM-ddTHH:mm:ssZ", System.Globalization.CultureInfo.InvariantCulture);
        return Task.FromResult(health.IsAlive(allowance)
            ? HealthCheckResult.Healthy($"last cycle at {last}")
            : HealthCheckResult.Unhealthy($"no cycle since {last} (allowed: {allowance.TotalSeconds:F0} s)"));
    }
}
