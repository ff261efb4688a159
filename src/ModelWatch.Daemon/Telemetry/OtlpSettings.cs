using Microsoft.Extensions.Configuration;
using OpenTelemetry.Exporter;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The standard <c>OTEL_EXPORTER_OTLP_*</c> settings read from configuration (environment variables are one of its
/// layers), for the two exporters that would otherwise read the process environment only: the alert-event pipeline
/// and Serilog's sink. Metrics and traces get the same settings through the SDK's own configuration binding.
/// </summary>
public static class OtlpSettings
{
    /// <summary>Whether an OTLP endpoint is configured (nothing is exported without one).</summary>
    public static bool Configured(IConfiguration configuration) =>
        !string.IsNullOrWhiteSpace(configuration?["OTEL_EXPORTER_OTLP_ENDPOINT"]);

    /// <summary>True for <c>http/protobuf</c>, false for <c>grpc</c> (the default).</summary>
    public static bool UsesHttp(IConfiguration configuration) =>
        string.Equals(configuration?["OTEL_EXPORTER_OTLP_PROTOCOL"]?.Trim(), "http/protobuf", StringComparison.OrdinalIgnoreCase);

    /// <summary>The endpoint for logs: the base endpoint, with <c>/v1/logs</c> appended for HTTP as the specification says.</summary>
    public static Uri LogsEndpoint(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        string endpoint = configuration["OTEL_EXPORTER_OTLP_ENDPOINT"]!.Trim();
        return new Uri(UsesHttp(configuration) ? endpoint.TrimEnd('/') + "/v1/logs" : endpoint);
    }

    /// <summary>The headers (<c>key=value,key=value</c>, values percent-decoded).</summary>
    public static Dictionary<string, string> Headers(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        return OtelKeyValueList.Parse(configuration["OTEL_EXPORTER_OTLP_HEADERS"], StringComparer.OrdinalIgnoreCase);
    }

    /// <summary>Sets an SDK exporter's options for logs from configuration.</summary>
    public static void ApplyToLogs(OtlpExporterOptions options, IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(options);
        options.Protocol = UsesHttp(configuration) ? OtlpExportProtocol.HttpProtobuf : OtlpExportProtocol.Grpc;
        options.Endpoint = LogsEndpoint(configuration);
        if (configuration["OTEL_EXPORTER_OTLP_HEADERS"] is { Length: > 0 } headers)
        {
            options.Headers = headers;
        }
    }
}
