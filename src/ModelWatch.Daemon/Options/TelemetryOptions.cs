using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>
/// Telemetry settings beyond the standard <c>OTEL_*</c> variables (configuration section <c>Telemetry</c>).
/// OTLP export is configured by <c>OTEL_EXPORTER_OTLP_ENDPOINT</c> and friends; without an endpoint nothing is exported.
/// </summary>
public sealed class TelemetryOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Telemetry";

    /// <summary>Serve a Prometheus scrape endpoint (unauthenticated; meant for local use). Default false.</summary>
    public bool PrometheusEnabled { get; set; }

    /// <summary>Host of the scrape endpoint. Default localhost.</summary>
    [Required]
    public string PrometheusHost { get; set; } = "localhost";

    /// <summary>Port of the scrape endpoint. Default 9464.</summary>
    [Range(1, 65535)]
    public int PrometheusPort { get; set; } = 9464;

    /// <summary>
    /// Attribute combinations kept per metric. OpenTelemetry's default of 2,000 is too few for per-model gauges with
    /// more than ~1,000 models (open alerts carry two series per model). Default 20,000.
    /// </summary>
    [Range(100, 1_000_000)]
    public int CardinalityLimit { get; set; } = 20_000;

    /// <summary>Write logs to the console as compact JSON (one object per line) instead of text. Default false.</summary>
    public bool JsonConsole { get; set; }
}
