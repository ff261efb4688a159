using Microsoft.Extensions.Configuration;
using ModelWatch.Daemon.Options;
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
        return OtelKeyValueList.Parse(configuration["OTEL_RESOURCE_ATTRIBUTES"]);
    }

    /// <summary>Everything the resource holds beyond the SDK's own attributes, for sinks that take a dictionary.</summary>
    public static Dictionary<string, object> AsDictionary(IConfiguration configuration, string workerId)
    {
        var all = Attributes(configuration).ToDictionary(p => p.Key, p => (object)p.Value, StringComparer.Ordinal);
        all["service.name"] = ServiceName(configuration);
        all.TryAdd("service.instance.id", workerId);
        return all;
    }

    /// <summary>The worker id the daemon will use (<c>Daemon:WorkerId</c>, else its default), for <c>service.instance.id</c>.</summary>
    public static string WorkerId(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        return configuration[$"{DaemonOptions.Section}:{nameof(DaemonOptions.WorkerId)}"] is { Length: > 0 } worker ? worker : new DaemonOptions().WorkerId;
    }

    /// <summary>Sets the resource of an SDK provider: the SDK's defaults, then these attributes (which win).</summary>
    public static ResourceBuilder Configure(ResourceBuilder builder, IConfiguration configuration, string workerId)
    {
        ArgumentNullException.ThrowIfNull(builder);
        return builder.AddAttributes(AsDictionary(configuration, workerId));
    }
}
