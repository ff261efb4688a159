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

    /// <summary>Serve the Prometheus scrape at <c>/metrics</c> on the HTTP endpoint (needs <c>Http:Enabled</c>; unauthenticated). Default false.</summary>
    public bool PrometheusEnabled { get; set; }

    /// <summary>
    /// Attribute combinations kept per metric. OpenTelemetry's default of 2,000 is too few for per-model gauges with
    /// more than ~1,000 models (open alerts carry two series per model). Default 20,000.
    /// </summary>
    [Range(100, 1_000_000)]
    public int CardinalityLimit { get; set; } = 20_000;

    /// <summary>Write logs to the console as compact JSON (one object per line) instead of text. Default false.</summary>
    public bool JsonConsole { get; set; }
}
