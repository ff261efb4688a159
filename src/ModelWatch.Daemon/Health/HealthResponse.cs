using System.Text.Json;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.Diagnostics.HealthChecks;

namespace ModelWatch.Daemon.Health;

/// <summary>Writes a health report as JSON: the overall status and each check's status, description and data.</summary>
public static class HealthResponse
{
    /// <summary>The response writer for the health endpoints.</summary>
    public static async Task WriteAsync(HttpContext context, HealthReport report)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(report);
        context.Response.ContentType = "application/json; charset=utf-8";
        await using var writer = new Utf8JsonWriter(context.Response.Body);
        writer.WriteStartObject();
        writer.WriteString("status", Name(report.Status));
        writer.WriteStartObject("checks");
        foreach ((string name, HealthReportEntry entry) in report.Entries)
        {
            writer.WriteStartObject(name);
            writer.WriteString("status", Name(entry.Status));
            writer.WriteString("description", entry.Description);
            if (entry.Data.Count > 0)
            {
                writer.WriteStartObject("data");
                foreach ((string key, object value) in entry.Data)
                {
                    writer.WriteString(key, Convert.ToString(value, System.Globalization.CultureInfo.InvariantCulture));
                }

                writer.WriteEndObject();
            }

            writer.WriteEndObject();
        }

        writer.WriteEndObject();
        writer.WriteEndObject();
        await writer.FlushAsync(context.RequestAborted);
    }

    private static string Name(HealthStatus status) => status switch
    {
        HealthStatus.Healthy => "healthy",
        HealthStatus.Degraded => "degraded",
        _ => "unhealthy",
    };
}
