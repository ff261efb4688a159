using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using ModelWatch.Daemon.Options;
using Serilog;
using Serilog.Events;
using Serilog.Formatting.Compact;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Builds the Generic Host that <c>modelwatch daemon</c> runs: configuration from appsettings.json (beside the binary
/// and in the working folder), an optional file named by <c>MODELWATCH_SETTINGS</c>, and environment variables;
/// Serilog for ordinary logs (console text or compact JSON, plus OTLP when <c>OTEL_EXPORTER_OTLP_ENDPOINT</c> is set);
/// systemd notification when run as a <c>Type=notify</c> unit.
/// </summary>
public static class DaemonHost
{
    /// <summary>Creates the host; <paramref name="configure"/> lets a caller (the demo, tests) adjust services.</summary>
    public static IHost Build(string[] args, string? databaseOption = null, Action<IConfigurationBuilder>? configuration = null, Action<IServiceCollection>? configure = null)
    {
        HostApplicationBuilder builder = Host.CreateApplicationBuilder(new HostApplicationBuilderSettings { Args = args, ContentRootPath = Directory.GetCurrentDirectory() });
        builder.Configuration.AddJsonFile(Path.Combine(AppContext.BaseDirectory, "appsettings.json"), optional: true, reloadOnChange: false);
        if (Environment.GetEnvironmentVariable("MODELWATCH_SETTINGS") is { Length: > 0 } settings)
        {
            builder.Configuration.AddJsonFile(Path.GetFullPath(settings), optional: false, reloadOnChange: false);
        }

        builder.Configuration.AddEnvironmentVariables();
        configuration?.Invoke(builder.Configuration);
        builder.Services.AddSystemd();
        builder.Services.AddSerilog((_, logger) => ConfigureSerilog(logger, builder.Configuration));
        configure?.Invoke(builder.Services);
        builder.Services.AddModelWatchDaemon(builder.Configuration, databaseOption);
        return builder.Build();
    }

    private static void ConfigureSerilog(LoggerConfiguration logger, ConfigurationManager configuration)
    {
        var telemetry = configuration.GetSection(TelemetryOptions.Section).Get<TelemetryOptions>() ?? new TelemetryOptions();
        logger.MinimumLevel.Information()
            .MinimumLevel.Override("Microsoft", LogEventLevel.Warning)
            .MinimumLevel.Override("System.Net.Http", LogEventLevel.Warning)
            .MinimumLevel.Override("Npgsql", LogEventLevel.Warning)
            .Enrich.FromLogContext();
        if (telemetry.JsonConsole)
        {
            logger.WriteTo.Console(new RenderedCompactJsonFormatter());
        }
        else
        {
            logger.WriteTo.Console(outputTemplate: "{Timestamp:yyyy-MM-ddTHH:mm:ss.fffZ} {Level:u3} {Message:lj}{NewLine}{Exception}", formatProvider: System.Globalization.CultureInfo.InvariantCulture);
        }

        if (!string.IsNullOrWhiteSpace(configuration["OTEL_EXPORTER_OTLP_ENDPOINT"]))
        {
            // Ordinary logs only: alert events travel through the OpenTelemetry pipeline that keeps their EventName.
            logger.WriteTo.OpenTelemetry();
        }
    }
}
