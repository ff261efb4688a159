using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Server.Kestrel.Core;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Hosting.Internal;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Daemon.Web;
using ModelWatch.Store.Configuration;
using Serilog;
using ILogger = Microsoft.Extensions.Logging.ILogger;
using Serilog.Filters;
using Serilog.Formatting.Compact;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Builds the host that <c>modelwatch daemon</c> runs. Configuration comes from <see cref="ConfigurationLayers"/> (the
/// same path every command uses) and is audited first (<see cref="DaemonSettings"/>): every problem at once, before
/// anything starts. With <c>Http:Enabled</c> the host is an ASP.NET Core application on Kestrel serving health and the
/// Prometheus scrape (<see cref="HttpEndpoint"/>); without, a plain host. Serilog writes ordinary logs (console text
/// in UTC or compact JSON, plus OTLP when <c>OTEL_EXPORTER_OTLP_ENDPOINT</c> is set); systemd is notified when the
/// daemon runs as a <c>Type=notify</c> unit.
/// </summary>
public static class DaemonHost
{
    /// <summary>Creates the host; <paramref name="configuration"/> and <paramref name="configure"/> let a caller (the demo, tests) adjust settings and services.</summary>
    /// <exception cref="DaemonConfigurationException">The configuration has problems (all are listed).</exception>
    public static IHost Build(string[] args, string? databaseOption = null, Action<IConfigurationBuilder>? configuration = null, Action<IServiceCollection>? configure = null)
    {
        string folder = Directory.GetCurrentDirectory();
        string environment = ConfigurationLayers.EnvironmentName();
        var settings = new ConfigurationManager();
        KeyValuePair<string, string?>[]? options = string.IsNullOrWhiteSpace(databaseOption) ? null : [new(ConnectionSettings.StateKey, databaseOption)];
        try
        {
            settings.AddModelWatchLayers(folder, environment, options);
            configuration?.Invoke(settings);
        }
        catch (InvalidDataException ex)
        {
            throw new DaemonConfigurationException([$"settings: {ex.Message} {ex.InnerException?.Message}".TrimEnd()]);
        }

        (IReadOnlyList<string> problems, IReadOnlyList<string> warnings) = DaemonSettings.Audit(settings);
        if (problems.Count > 0)
        {
            throw new DaemonConfigurationException(problems);
        }

        HttpOptions http = settings.GetSection(HttpOptions.Section).Get<HttpOptions>() ?? new HttpOptions();
        TelemetryOptions telemetry = settings.GetSection(TelemetryOptions.Section).Get<TelemetryOptions>() ?? new TelemetryOptions();
        IHost host;
        if (http.Enabled)
        {
            WebApplicationBuilder builder = WebApplication.CreateEmptyBuilder(new WebApplicationOptions { Args = args, EnvironmentName = environment, ContentRootPath = folder });
            builder.Configuration.AddConfiguration(settings);
            IReadOnlyList<ListenAddress> addresses = ListenAddress.ParseAll(http.Urls, []);
            builder.WebHost.UseKestrelCore().ConfigureKestrel(kestrel => Listen(kestrel, addresses));
            builder.Services.AddRoutingCore();
            AddServices(builder, databaseOption, configure);
            WebApplication app = builder.Build();
            HttpEndpoint.Map(app, telemetry.PrometheusEnabled);
            if (settings.GetSection(WebOptions.Section).Get<WebOptions>() is { Enabled: true } web)
            {
                WebPages.Map(app, web);
            }

            host = app;
        }
        else
        {
            HostApplicationBuilder builder = Host.CreateEmptyApplicationBuilder(new HostApplicationBuilderSettings { Args = args, EnvironmentName = environment, ContentRootPath = folder });
            builder.Configuration.AddConfiguration(settings);
            AddServices(builder, databaseOption, configure);
            host = builder.Build();
        }

        ILogger logger = host.Services.GetRequiredService<ILoggerFactory>().CreateLogger("ModelWatch.Configuration");
        foreach (string warning in warnings)
        {
            DaemonLog.LogUnknownSetting(logger, warning);
        }

        return host;
    }

    private static void AddServices(IHostApplicationBuilder builder, string? databaseOption, Action<IServiceCollection>? configure)
    {
        IConfiguration configuration = builder.Configuration;

        // The empty builders register no lifetime: SIGTERM and Ctrl+C must stop the host gracefully (exit 0), and under
        // systemd its own lifetime replaces this one.
        builder.Services.AddSingleton<IHostLifetime, ConsoleLifetime>();
        builder.Services.Configure<ConsoleLifetimeOptions>(o => o.SuppressStatusMessages = true);
        builder.Services.AddSystemd();
        builder.Services.AddSerilog((_, logger) => ConfigureSerilog(logger, configuration));
        configure?.Invoke(builder.Services);
        builder.Services.AddModelWatchDaemon(configuration, databaseOption);
    }

    private static void Listen(KestrelServerOptions kestrel, IReadOnlyList<ListenAddress> addresses)
    {
        kestrel.AddServerHeader = false;

        // Nothing the endpoint serves takes a body; anything larger than this is refused before it is read.
        kestrel.Limits.MaxRequestBodySize = 64 * 1024;
        kestrel.Limits.MaxRequestHeadersTotalSize = 32 * 1024;
        kestrel.Limits.MaxConcurrentConnections = 256;
        foreach (ListenAddress address in addresses)
        {
            if (address.AnyAddress)
            {
                kestrel.ListenAnyIP(address.Port);
            }
            else if (address.Address is { } ip)
            {
                kestrel.Listen(ip, address.Port);
            }
            else
            {
                kestrel.ListenLocalhost(address.Port);
            }
        }
    }

    /// <summary>Serilog from configuration: levels from <c>Logging:LogLevel</c>, console text with UTC times or compact JSON, OTLP when configured.</summary>
    internal static void ConfigureSerilog(LoggerConfiguration logger, IConfiguration configuration)
    {
        var telemetry = configuration.GetSection(TelemetryOptions.Section).Get<TelemetryOptions>() ?? new TelemetryOptions();
        LogLevels.Apply(logger, configuration);
        logger.Enrich.FromLogContext().Enrich.With<UtcTimestampEnricher>();
        if (telemetry.JsonConsole)
        {
            logger.WriteTo.Console(new RenderedCompactJsonFormatter());
        }
        else
        {
            logger.WriteTo.Console(outputTemplate: "{" + UtcTimestampEnricher.Property + "} {Level:u3} {Message:lj}{NewLine}{Exception}", formatProvider: System.Globalization.CultureInfo.InvariantCulture);
        }

        if (OtlpSettings.Configured(configuration))
        {
            // Ordinary logs only: alert events are exported once, by the OpenTelemetry pipeline that keeps their EventName.
            Dictionary<string, object> resource = TelemetryResource.AsDictionary(configuration, TelemetryResource.WorkerId(configuration));
            logger.WriteTo.Logger(otlp => otlp
                .Filter.ByExcluding(Matching.FromSource<AlertEventLogger>())
                .WriteTo.OpenTelemetry(o =>
                {
                    o.Endpoint = OtlpSettings.LogsEndpoint(configuration).ToString();
                    o.Protocol = OtlpSettings.UsesHttp(configuration) ? Serilog.Sinks.OpenTelemetry.OtlpProtocol.HttpProtobuf : Serilog.Sinks.OpenTelemetry.OtlpProtocol.Grpc;
                    o.Headers = OtlpSettings.Headers(configuration);
                    o.ResourceAttributes = resource;
                }));
        }
    }
}
