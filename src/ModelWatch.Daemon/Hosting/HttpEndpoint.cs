using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Diagnostics.HealthChecks;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Diagnostics.HealthChecks;
using ModelWatch.Daemon.Health;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// The routes of the daemon's HTTP endpoint on Kestrel: <c>/healthz/live</c> (the loop cycles), <c>/healthz/ready</c>
/// (the state database answers and is migrated; sources are reported, a silent one as degraded), and <c>/metrics</c>
/// (the Prometheus scrape) when enabled. Read-only: GET and HEAD; other methods get 405, other paths 404. A bad request
/// ends that request only; Kestrel's limits refuse oversized ones before they are read.
/// </summary>
public static class HttpEndpoint
{
    /// <summary>The liveness path.</summary>
    public const string LivePath = "/healthz/live";

    /// <summary>The readiness path.</summary>
    public const string ReadyPath = "/healthz/ready";

    /// <summary>The Prometheus scrape path.</summary>
    public const string MetricsPath = "/metrics";

    /// <summary>The health-check tag of liveness checks.</summary>
    public const string LiveTag = "live";

    /// <summary>The health-check tag of readiness checks.</summary>
    public const string ReadyTag = "ready";

    /// <summary>Maps the routes onto the application.</summary>
    public static void Map(WebApplication app, bool prometheus)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.Use(async (context, next) =>
        {
            if (!HttpMethods.IsGet(context.Request.Method) && !HttpMethods.IsHead(context.Request.Method))
            {
                context.Response.StatusCode = StatusCodes.Status405MethodNotAllowed;
                context.Response.Headers.Allow = "GET, HEAD";
                return;
            }

            await next(context);
        });
        app.MapHealthChecks(LivePath, Options(LiveTag));
        app.MapHealthChecks(ReadyPath, Options(ReadyTag));
        if (prometheus)
        {
            app.MapPrometheusScrapingEndpoint(MetricsPath);
        }
    }

    private static HealthCheckOptions Options(string tag) => new()
    {
        Predicate = registration => registration.Tags.Contains(tag),
        ResponseWriter = HealthResponse.WriteAsync,
        AllowCachingResponses = false,
        ResultStatusCodes =
        {
            [HealthStatus.Healthy] = StatusCodes.Status200OK,
            [HealthStatus.Degraded] = StatusCodes.Status200OK,
            [HealthStatus.Unhealthy] = StatusCodes.Status503ServiceUnavailable,
        },
    };
}
