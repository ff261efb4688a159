using System.Diagnostics;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;
using OpenTelemetry;
using OpenTelemetry.Logs;
using OpenTelemetry.Metrics;
using OpenTelemetry.Resources;
using OpenTelemetry.Trace;

namespace ModelWatch.Daemon.Tests.Telemetry;

/// <summary>One telemetry pipeline: one resource for every signal, one trace per run, alert events once and inside their run's trace.</summary>
public sealed class TelemetryPipelineTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    private const string BrokenQuery = "SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments_gone WHERE shipped_at >= @window_start AND shipped_at < @window_end";

    [Fact]
    public async Task A_run_is_one_trace_whose_persist_is_a_child_and_whose_alert_events_carry_its_trace_id()
    {
        await DaemonTestData.PrepareAsync(database, hours: 48);
        await DaemonTestData.ScalarAsync(database.DataSource, "WITH d AS (UPDATE modelwatch.model SET enabled = false, lease_owner = NULL, lease_expires_at = NULL RETURNING 1) SELECT count(*) FROM d");
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "traced-broken");
        await DaemonTestData.ApplyQueryAsync(database, time, "traced-broken", BrokenQuery);
        var activities = new List<Activity>();
        var records = new List<LogRecord>();
        await using var daemon = new DaemonInstance(database, time, "tracer", concurrency: 1, configure: services =>
        {
            services.ConfigureOpenTelemetryTracerProvider(b => b.AddInMemoryExporter(activities));
            services.AddSingleton(sp => new AlertEventPipeline(o => o.AddInMemoryExporter(records), sp.GetRequiredService<ILoggerFactory>()));
        });
        TracerProvider tracer = daemon.Services.GetRequiredService<TracerProvider>();
        await daemon.StartAsync();
        for (int hour = 1; hour <= 3; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'traced-broken'", hour);
        }

        // Polls while nothing is due: their database calls start no trace.
        for (int poll = 0; poll < 5; poll++)
        {
            time.Advance(TimeSpan.FromMinutes(1));
            await daemon.WaitForCycleAsync(time);
        }

        await daemon.StopAsync();
        tracer.ForceFlush();
        List<Activity> all;
        lock (activities)
        {
            all = [.. activities];
        }

        List<Activity> runs = [.. all.Where(a => a.OperationName == "modelwatch.run" && (string?)a.GetTagItem(TelemetryNames.ModelTag) == "traced-broken").OrderBy(a => a.StartTimeUtc)];
        Assert.Equal(3, runs.Count);
        Assert.All(runs, run => Assert.Equal(default, run.ParentSpanId));
        Assert.All(runs, run => Assert.Equal("failed", run.GetTagItem(TelemetryNames.StatusTag)));
        foreach (Activity run in runs)
        {
            Assert.Equal(run.SpanId, all.Single(a => a.OperationName == "modelwatch.run.persist" && a.TraceId == run.TraceId).ParentSpanId);
            Assert.Equal(run.SpanId, all.Single(a => a.OperationName == "modelwatch.run.read" && a.TraceId == run.TraceId).ParentSpanId);
        }

        Assert.DoesNotContain(all, a => a.Kind == ActivityKind.Client && a.ParentSpanId == default);

        LogRecord opened = Assert.Single(records, r => r.EventId.Name == "modelwatch.alert.opened");
        Assert.Equal(runs[2].TraceId, opened.TraceId);
        Assert.Equal(runs[2].SpanId, opened.SpanId);
        Assert.Equal("source", opened.Attributes!.Single(a => a.Key == TelemetryNames.CheckTag).Value);
    }

    [Theory]
    [InlineData("checkout-watch", "deployment.environment=staging", "checkout-watch")]
    [InlineData(null, "service.name=from-attributes,deployment.environment=staging", "from-attributes")]
    [InlineData(null, "deployment.environment=staging", "modelwatch")]
    public void Every_signal_takes_its_service_name_and_attributes_from_the_standard_variables(string? serviceName, string attributes, string expected)
    {
        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["ConnectionStrings:State"] = database.ConnectionString,
            ["Daemon:WorkerId"] = "replica-7",
            ["OTEL_SERVICE_NAME"] = serviceName,
            ["OTEL_RESOURCE_ATTRIBUTES"] = attributes,
        }).Build();
        using ServiceProvider services = new ServiceCollection().AddLogging().AddModelWatchDaemon(configuration).BuildServiceProvider();

        foreach (Resource resource in new[] { services.GetRequiredService<TracerProvider>().GetResource(), services.GetRequiredService<MeterProvider>().GetResource() })
        {
            var values = resource.Attributes.ToDictionary(a => a.Key, a => a.Value);
            Assert.Equal(expected, values["service.name"]);
            Assert.Equal("staging", values["deployment.environment"]);
            Assert.Equal("replica-7", values["service.instance.id"]);
        }

        // Serilog's OTLP sink and the alert-event pipeline are given the same attributes.
        Dictionary<string, object> shared = TelemetryResource.AsDictionary(configuration, "replica-7");
        Assert.Equal(expected, shared["service.name"]);
        Assert.Equal("staging", shared["deployment.environment"]);
    }
}
