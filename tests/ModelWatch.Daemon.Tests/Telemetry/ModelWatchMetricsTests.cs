using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Runs;
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
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>(), TimeProvider.System);

        metrics.Update("gauge-courier", Values(new RunMeasurements(1.31, 12.5, 4.2, 0.08), warnings: 1));
        metrics.Update("gauge-bakery", Values(new RunMeasurements(0.98, 7.1, 0.6, 0.02)));
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
    public void A_gauge_holds_its_last_value_until_a_run_that_measures_it_replaces_it()
    {
        using ServiceProvider services = new ServiceCollection().AddMetrics().BuildServiceProvider();
        var exported = new List<Metric>();
        using MeterProvider provider = Sdk.CreateMeterProviderBuilder().AddMeter(TelemetryNames.Source).AddInMemoryExporter(exported).Build();
        var time = new Microsoft.Extensions.Time.Testing.FakeTimeProvider(new DateTimeOffset(2026, 12, 1, 0, 0, 0, TimeSpan.Zero));
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>(), time);
        DateTimeOffset newest = time.GetUtcNow().AddHours(-2);

        metrics.Update("gauge-courier", Values(new RunMeasurements(1.31, 12.5, 4.2, 0.08), failures: 0, newest: newest, lastRun: time.GetUtcNow()));

        // A failed run measures nothing: the measured gauges keep their values; the failure count and run age move on.
        time.Advance(TimeSpan.FromHours(6));
        metrics.Update("gauge-courier", Values(RunMeasurements.None, failures: 1, lastRun: time.GetUtcNow()));
        time.Advance(TimeSpan.FromMinutes(30));
        provider.ForceFlush();

        Assert.Equal(0.08, Points(exported, TelemetryNames.MaxPsi).Single().GetGaugeLastValueDouble());
        Assert.Equal(4.2, Points(exported, TelemetryNames.MaxCoefficientZ).Single().GetGaugeLastValueDouble());
        Assert.Equal(1.0, Points(exported, TelemetryNames.ConsecutiveFailures).Single().GetGaugeLastValueDouble());
        Assert.Equal(TimeSpan.FromHours(8.5).TotalSeconds, Points(exported, TelemetryNames.DataAge).Single().GetGaugeLastValueDouble(), 6);
        Assert.Equal(TimeSpan.FromMinutes(30).TotalSeconds, Points(exported, TelemetryNames.LastRunAge).Single().GetGaugeLastValueDouble(), 6);
        Assert.Equal(TimeSpan.FromHours(6).TotalSeconds, Points(exported, TelemetryNames.SchedulePeriod).Single().GetGaugeLastValueDouble());

        // The next run that tests the features replaces the value.
        exported.Clear();
        metrics.Update("gauge-courier", Values(new RunMeasurements(double.NaN, double.NaN, double.NaN, 0.31), failures: 0, lastRun: time.GetUtcNow()));
        provider.ForceFlush();
        Assert.Equal(0.31, Points(exported, TelemetryNames.MaxPsi).Single().GetGaugeLastValueDouble());
        Assert.Equal(0.0, Points(exported, TelemetryNames.ConsecutiveFailures).Single().GetGaugeLastValueDouble());
    }

    [Fact]
    public void Runs_are_counted_by_outcome_with_durations_in_seconds()
    {
        using ServiceProvider services = new ServiceCollection().AddMetrics().BuildServiceProvider();
        var exported = new List<Metric>();
        using MeterProvider provider = Sdk.CreateMeterProviderBuilder().AddMeter(TelemetryNames.Source).AddInMemoryExporter(exported).Build();
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>(), TimeProvider.System);

        metrics.RecordRun("counted-courier", RunStatus.Ok, TimeSpan.FromMilliseconds(250), 1200, 3);
        metrics.RecordRun("counted-courier", RunStatus.Failed, TimeSpan.FromSeconds(2), 0, 0, "57014");
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

        events.Publish(new AlertEvent(7, "opened", "gauge-courier", "residuals", null, "warning", "open", "bias_t", -4.47, 3.9, "mean residual −95.5", DateTimeOffset.UnixEpoch)
        {
            PValue = 1e-5,
            Alpha = 6e-6,
            Limit = 3.9,
            PreviousAlertId = 4,
        });

        LogRecord record = Assert.Single(records);
        Assert.Equal("modelwatch.alert.opened", record.EventId.Name);
        var attributes = record.Attributes!.ToDictionary(a => a.Key, a => a.Value);
        Assert.Equal("gauge-courier", attributes[TelemetryNames.ModelTag]);
        Assert.Equal("residuals", attributes[TelemetryNames.CheckTag]);
        Assert.Null(attributes[TelemetryNames.SubjectTag]);
        Assert.Equal("bias_t", attributes[TelemetryNames.StatisticTag]);
        Assert.Equal(-4.47, attributes[TelemetryNames.ValueTag]);
        Assert.Equal(3.9, attributes[TelemetryNames.ThresholdTag]);
        Assert.Equal(1e-5, attributes[TelemetryNames.PValueTag]);
        Assert.Equal(6e-6, attributes[TelemetryNames.AlphaTag]);
        Assert.Equal(3.9, attributes[TelemetryNames.LimitTag]);
        Assert.Equal(4L, attributes["modelwatch.alert.previous_id"]);
        Assert.Contains("(again, after #4)", record.FormattedMessage ?? record.Body, StringComparison.Ordinal);
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

    private static ModelGaugeValues Values(RunMeasurements measured, int warnings = 0, int? failures = null, DateTimeOffset? newest = null, DateTimeOffset? lastRun = null) =>
        new(measured, warnings, 0, false, failures, newest, lastRun ?? TimeProvider.System.GetUtcNow(), TimeSpan.FromHours(6));

    private static long SumLong(List<Metric> exported, string name) => Points(exported, name).Sum(p => p.GetSumLong());
}
