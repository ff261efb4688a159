using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Telemetry;
using OpenTelemetry;
using OpenTelemetry.Logs;
using OpenTelemetry.Metrics;

namespace ModelWatch.Daemon.Tests.Telemetry;

public sealed class ModelWatchMetricsTests
{
    [Fact]
    public void Per_model_gauges_disappear_when_a_model_is_forgotten()
    {
        using ServiceProvider services = new ServiceCollection().AddMetrics().BuildServiceProvider();
        var exported = new List<Metric>();
        using MeterProvider provider = Sdk.CreateMeterProviderBuilder()
            .AddMeter(TelemetryNames.Source)
            .AddInMemoryExporter(exported)
            .Build();
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>());

        metrics.Update("gauge-courier", new ModelGaugeValues(1.31, 12.5, 4.2, 0.08, 1, 0));
        metrics.Update("gauge-bakery", new ModelGaugeValues(0.98, 7.1, 0.6, 0.02, 0, 0));
        provider.ForceFlush();
        Assert.Equal(2, Points(exported, TelemetryNames.RmseRatio).Count);
        Assert.Equal(1.31, Points(exported, TelemetryNames.RmseRatio).Single(p => Model(p) == "gauge-courier").GetGaugeLastValueDouble());

        exported.Clear();
        metrics.Forget("gauge-bakery");
        provider.ForceFlush();
        Assert.Equal(["gauge-courier"], Points(exported, TelemetryNames.RmseRatio).Select(Model));
        Assert.Equal(2, Points(exported, TelemetryNames.OpenAlerts).Count);
    }

    [Fact]
    public void Runs_are_counted_by_outcome_with_durations_in_seconds()
    {
        using ServiceProvider services = new ServiceCollection().AddMetrics().BuildServiceProvider();
        var exported = new List<Metric>();
        using MeterProvider provider = Sdk.CreateMeterProviderBuilder().AddMeter(TelemetryNames.Source).AddInMemoryExporter(exported).Build();
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>());

        metrics.RecordRun("counted-courier", "ok", TimeSpan.FromMilliseconds(250), 1200, 3);
        metrics.RecordRun("counted-courier", "failed", TimeSpan.FromSeconds(2), 0, 0, "57014");
        provider.ForceFlush();

        Assert.Equal("{run}", exported.First(m => m.Name == TelemetryNames.Runs).Unit);
        Assert.Equal("s", exported.First(m => m.Name == TelemetryNames.RunDuration).Unit);
        var sums = Points(exported, TelemetryNames.RunDuration).Select(p => p.GetHistogramSum()).ToList();

        Assert.Contains(0.25, sums);
        Assert.Contains(2.0, sums);
        Assert.Equal(1200, SumLong(exported, TelemetryNames.RowsRead));
    }

    [Fact]
    public void Alert_transitions_are_exported_with_a_stable_event_name_and_attributes()
    {
        var records = new List<LogRecord>();
        using var ordinary = LoggerFactory.Create(_ => { });
        using var pipeline = new AlertEventPipeline(o => o.AddInMemoryExporter(records), ordinary);
        var events = new AlertEventLogger(pipeline.Factory.CreateLogger<AlertEventLogger>());

        events.Publish(new AlertEvent(7, "opened", "gauge-courier", "residuals", null, "warning", "open", "bias_t", -4.47, 3.9, "mean residual −95.5", DateTimeOffset.UnixEpoch));

        LogRecord record = Assert.Single(records);
        Assert.Equal("modelwatch.alert.opened", record.EventId.Name);
        var attributes = record.Attributes!.ToDictionary(a => a.Key, a => a.Value);
        Assert.Equal("gauge-courier", attributes[TelemetryNames.ModelTag]);
        Assert.Equal("residuals", attributes[TelemetryNames.CheckTag]);
        Assert.Null(attributes[TelemetryNames.SubjectTag]);
        Assert.Equal("bias_t", attributes[TelemetryNames.StatisticTag]);
        Assert.Equal(-4.47, attributes[TelemetryNames.ValueTag]);
        Assert.Equal(3.9, attributes[TelemetryNames.ThresholdTag]);
    }

    /// <summary>
    /// Points of one instrument for this class's models only: the meter name is a constant, so daemons of other
    /// test classes running in parallel publish on meters this provider also listens to.
    /// </summary>
    private static List<MetricPoint> Points(List<Metric> exported, string name)
    {
        string[] ours = ["gauge-courier", "gauge-bakery", "counted-courier"];
        var points = new List<MetricPoint>();
        foreach (Metric metric in exported.Where(m => m.Name == name))
        {
            foreach (ref readonly MetricPoint point in metric.GetMetricPoints())
            {
                if (ours.Contains(Model(point)))
                {
                    points.Add(point);
                }
            }
        }

        return points;
    }

    private static string Model(MetricPoint point)
    {
        foreach (KeyValuePair<string, object?> tag in point.Tags)
        {
            if (tag.Key == TelemetryNames.ModelTag)
            {
                return (string)tag.Value!;
            }
        }

        return string.Empty;
    }

    private static long SumLong(List<Metric> exported, string name) => Points(exported, name).Sum(p => p.GetSumLong());
}
