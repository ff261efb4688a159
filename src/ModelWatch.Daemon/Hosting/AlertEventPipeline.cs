using Microsoft.Extensions.Logging;
using OpenTelemetry.Logs;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// A logging pipeline of its own for alert events: the OpenTelemetry logger provider, which exports
/// <c>EventId.Name</c> as the OTLP EventName, unlike Serilog's OTLP sink. Ordinary logs go through Serilog; only
/// alert transitions travel here (and are also written to the ordinary log for people reading the console).
/// </summary>
public sealed class AlertEventPipeline : IDisposable
{
    /// <summary>Builds the pipeline; <paramref name="configure"/> sets the resource and adds exporters (OTLP in production, in-memory in tests).</summary>
    public AlertEventPipeline(Action<OpenTelemetryLoggerOptions> configure, ILoggerFactory ordinaryLogs)
    {
        ArgumentNullException.ThrowIfNull(configure);
        ArgumentNullException.ThrowIfNull(ordinaryLogs);
        Factory = LoggerFactory.Create(builder =>
        {
            builder.AddOpenTelemetry(options =>
            {
                options.IncludeFormattedMessage = true;
                options.ParseStateValues = true;
                configure(options);
            });
            builder.AddProvider(new ForwardingLoggerProvider(ordinaryLogs));
        });
    }

    /// <summary>The factory alert-event loggers come from.</summary>
    public ILoggerFactory Factory { get; }

    /// <inheritdoc />
    public void Dispose() => Factory.Dispose();
}
