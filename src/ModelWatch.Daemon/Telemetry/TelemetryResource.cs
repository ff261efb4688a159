using Microsoft.Extensions.Configuration;
using OpenTelemetry.Resources;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The one resource every signal carries (metrics, traces, alert events, and Serilog's OTLP logs): <c>service.name</c>
/// from <c>OTEL_SERVICE_NAME</c>, else from <c>OTEL_RESOURCE_ATTRIBUTES</c>, else <c>modelwatch</c>; the other
/// <c>OTEL_RESOURCE_ATTRIBUTES</c> as given; <c>service.instance.id</c> the worker id unless given.
/// </summary>
public static class TelemetryResource
{
    /// <summary>The service name when the environment names none.</summary>
    public const string DefaultServiceName = "modelwatch";

    /// <summary>The service name the standard variables give, else <see cref="DefaultServiceName"/>.</summary>
    public static string ServiceName(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        if (configuration["OTEL_SERVICE_NAME"] is { Length: > 0 } name)
        {
            return name.Trim();
        }

        return Attributes(configuration).GetValueOrDefault("service.name") ?? DefaultServiceName;
    }

    /// <summary>The pairs of <c>OTEL_RESOURCE_ATTRIBUTES</c> (<c>key=value,key=value</c>, values percent-decoded).</summary>
    public static Dictionary<string, string> Attributes(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var attributes = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (string pair in (configuration["OTEL_RESOURCE_ATTRIBUTES"] ?? string.Empty).Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            int eq = pair.IndexOf('=', StringComparison.Ordinal);
            if (eq > 0)
            {
                attributes[pair[..eq].Trim()] = Uri.UnescapeDataString(pair[(eq + 1)..].Trim());
            }
        }

        return attributes;
    }

    /// <summary>Everything the resource holds beyond the SDK's own attributes, for sinks that take a dictionary.</summary>
    public static Dictionary<string, object> AsDictionary(IConfiguration configuration, string workerId)
    {
        var all = Attributes(configuration).ToDictionary(p => p.Key, p => (object)p.Value, StringComparer.Ordinal);
        all["service.name"] = ServiceName(configuration);
        all.TryAdd("service.instance.id", workerId);
        return all;
    }

    /// <summary>Sets the resource of an SDK provider: the SDK's defaults, then these attributes (which win).</summary>
    public static ResourceBuilder Configure(ResourceBuilder builder, IConfiguration configuration, string workerId)
    {
        ArgumentNullException.ThrowIfNull(builder);
        return builder.AddAttributes(AsDictionary(configuration, workerId));
    }
}
