using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Health;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Windows;
using Npgsql;
using OpenTelemetry;
using OpenTelemetry.Logs;
using OpenTelemetry.Metrics;
using OpenTelemetry.Resources;
using OpenTelemetry.Trace;

namespace ModelWatch.Daemon.Hosting;

/// <summary>Registers the daemon: options (validated at start), the store, the pipeline, the loop and telemetry.</summary>
public static class DaemonServiceCollectionExtensions
{
    /// <summary>The command timeout of state-database statements.</summary>
    public static readonly TimeSpan StateCommandTimeout = TimeSpan.FromSeconds(30);

    /// <summary>
    /// Adds everything <c>modelwatch daemon</c> runs. Parts are added with <c>TryAdd</c>, so a test can register
    /// its own <see cref="TimeProvider"/> or <see cref="StoreDataSources"/> first.
    /// </summary>
    public static IServiceCollection AddModelWatchDaemon(this IServiceCollection services, IConfiguration configuration, string? databaseOption = null)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(configuration);
        services.AddOptions<DaemonOptions>().Bind(configuration.GetSection(DaemonOptions.Section)).ValidateDataAnnotations().ValidateOnStart();
        services.AddOptions<HttpOptions>().Bind(configuration.GetSection(HttpOptions.Section)).ValidateDataAnnotations().ValidateOnStart();
        services.AddOptions<WebOptions>().Bind(configuration.GetSection(WebOptions.Section));
        services.AddOptions<RetentionOptions>().Bind(configuration.GetSection(RetentionOptions.Section)).ValidateDataAnnotations().ValidateOnStart();
        services.AddOptions<TelemetryOptions>().Bind(configuration.GetSection(TelemetryOptions.Section)).ValidateDataAnnotations().ValidateOnStart();
        services.AddOptions<SpecsOptions>().Bind(configuration.GetSection(SpecsOptions.Section));
        services.AddOptions<NotificationOptions>().Bind(configuration.GetSection(NotificationOptions.Section)).ValidateOnStart();
        services.TryAddEnumerable(ServiceDescriptor.Singleton<IValidateOptions<NotificationOptions>, NotificationOptionsValidator>());
        services.AddOptions<HostOptions>().Configure<IOptions<DaemonOptions>>((host, daemon) => host.ShutdownTimeout = daemon.Value.ShutdownTimeout + TimeSpan.FromSeconds(10));

        services.TryAddSingleton(TimeProvider.System);
        services.TryAddSingleton(_ => new StoreDataSources(configuration, databaseOption));
        services.TryAddSingleton<NpgsqlDataSource>(sp => sp.GetRequiredService<StoreDataSources>().State);
        services.TryAddSingleton(sp => new ModelRepository(sp.GetRequiredService<NpgsqlDataSource>(), sp.GetRequiredService<TimeProvider>(), StateCommandTimeout));
        services.TryAddSingleton(sp => new BaselineRepository(sp.GetRequiredService<NpgsqlDataSource>(), sp.GetRequiredService<TimeProvider>(), StateCommandTimeout));
        services.TryAddSingleton(sp => new LeaseRepository(sp.GetRequiredService<NpgsqlDataSource>(), StateCommandTimeout));
        services.TryAddSingleton(sp => new RunRecorder(sp.GetRequiredService<NpgsqlDataSource>(), StateCommandTimeout));
        services.TryAddSingleton(sp => new WindowReader(sp.GetRequiredService<StoreDataSources>().ReadOptions()));
        services.TryAddSingleton<BaselineCache>();
        services.TryAddSingleton<RunPipeline>();
        services.TryAddSingleton<RunCompletion>();
        services.TryAddSingleton<DaemonHealth>();
        services.TryAddSingleton<NotificationWakeup>();
        services.AddHttpClient<WebhookSender>();
        services.AddMetrics();
        services.AddHealthChecks()
            .AddCheck<LoopHealthCheck>(LoopHealthCheck.Name, tags: [HttpEndpoint.LiveTag])
            .AddCheck<StateDatabaseHealthCheck>(StateDatabaseHealthCheck.Name, tags: [HttpEndpoint.ReadyTag], timeout: TimeSpan.FromSeconds(10))
            .AddCheck<SourcesHealthCheck>(SourcesHealthCheck.Name, tags: [HttpEndpoint.ReadyTag], timeout: TimeSpan.FromSeconds(10));
        services.TryAddSingleton<ModelWatchMetrics>();
        services.TryAddSingleton(sp => new AlertEventPipeline(
            o =>
            {
                o.SetResourceBuilder(TelemetryResource.Configure(ResourceBuilder.CreateDefault(), configuration, sp.GetRequiredService<IOptions<DaemonOptions>>().Value.WorkerId));
                if (OtlpSettings.Configured(configuration))
                {
                    o.AddOtlpExporter(exporter => OtlpSettings.ApplyToLogs(exporter, configuration));
                }
            },
            sp.GetRequiredService<ILoggerFactory>()));
        services.TryAddSingleton(sp => new AlertEventLogger(sp.GetRequiredService<AlertEventPipeline>().Factory.CreateLogger<AlertEventLogger>()));

        services.AddHostedService<SchedulerService>();
        services.AddHostedService<NotificationDispatcher>();
        services.AddHostedService<SpecDirectorySync>();
        services.AddHostedService<RetentionService>();
        services.AddModelWatchTelemetry(configuration);
        return services;
    }

    /// <summary>
    /// Metrics and traces through the OpenTelemetry SDK, exported by OTLP when an endpoint is configured and scraped by
    /// Prometheus when enabled; one resource for every signal (<see cref="TelemetryResource"/>); traces only of runs.
    /// </summary>
    public static IServiceCollection AddModelWatchTelemetry(this IServiceCollection services, IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        var telemetry = configuration.GetSection(TelemetryOptions.Section).Get<TelemetryOptions>() ?? new TelemetryOptions();
        string worker = TelemetryResource.WorkerId(configuration);
        var builder = services.AddOpenTelemetry()
            .ConfigureResource(r => TelemetryResource.Configure(r, configuration, worker))
            .WithMetrics(m =>
            {
                m.AddMeter(TelemetryNames.Source).AddNpgsqlInstrumentation();
                m.AddView(instrument => instrument.Meter.Name == TelemetryNames.Source
                    ? new MetricStreamConfiguration { CardinalityLimit = telemetry.CardinalityLimit }
                    : null);
                if (telemetry.PrometheusEnabled)
                {
                    m.AddPrometheusExporter();
                }
            })
            .WithTracing(t => t.AddSource(TelemetryNames.Source).AddNpgsql().SetSampler(new ParentBasedSampler(new RunSpansOnlySampler())));
        if (OtlpSettings.Configured(configuration))
        {
            builder.UseOtlpExporter();
        }

        return services;
    }
}
