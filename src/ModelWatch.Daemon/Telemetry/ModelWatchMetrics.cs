using System.Collections.Concurrent;
using System.Diagnostics;
using System.Diagnostics.Metrics;
using ModelWatch.Daemon.Runs;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The daemon's instruments, created once from <see cref="IMeterFactory"/> (so tests get isolated meters).
/// Per-model values are observable gauges over a snapshot: each holds its last value until the model's next run
/// replaces it (<see cref="ModelGaugeValues.Over"/>); ages are computed at collection time; a model that is retired or
/// disabled is <see cref="Forget">forgotten</see> and disappears from the next collection, instead of exporting its
/// last value forever as a synchronous gauge would.
/// </summary>
public sealed class ModelWatchMetrics
{
    private static readonly double[] DurationBuckets = [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120, 300];
    private readonly ConcurrentDictionary<string, ModelGaugeValues> _models = new(StringComparer.Ordinal);
    private readonly Histogram<double> _runDuration;
    private readonly Counter<long> _runs;
    private readonly Counter<long> _rowsRead;
    private readonly Counter<long> _rowsRejected;
    private readonly Counter<long> _alertTransitions;

    private readonly TimeProvider _time;

    /// <summary>Creates the meter and its instruments.</summary>
    public ModelWatchMetrics(IMeterFactory meterFactory, TimeProvider time)
    {
        ArgumentNullException.ThrowIfNull(meterFactory);
        ArgumentNullException.ThrowIfNull(time);
        _time = time;
        Meter meter = meterFactory.Create(new MeterOptions(TelemetryNames.Source));
        _runDuration = meter.CreateHistogram(
            TelemetryNames.RunDuration,
            unit: "s",
            description: "Duration of a model run: read, fit, checks and persist.",
            advice: new InstrumentAdvice<double> { HistogramBucketBoundaries = DurationBuckets });
        _runs = meter.CreateCounter<long>(TelemetryNames.Runs, "{run}", "Model runs by outcome.");
        _rowsRead = meter.CreateCounter<long>(TelemetryNames.RowsRead, "{row}", "Rows read from data sources.");
        _rowsRejected = meter.CreateCounter<long>(TelemetryNames.RowsRejected, "{row}", "Rows left out for NULL or non-finite values.");
        _alertTransitions = meter.CreateCounter<long>(TelemetryNames.AlertTransitions, "{transition}", "Alert state changes.");
        meter.CreateObservableGauge(TelemetryNames.RmseRatio, () => Observe(v => v.Measurements.RmseRatio), "1", "Deployed model RMSE on the latest measured window over the baseline residual SD.");
        meter.CreateObservableGauge(TelemetryNames.ConditionNumber, () => Observe(v => v.Measurements.ConditionNumber), "1", "Scaled condition number of the latest measured window's design.");
        meter.CreateObservableGauge(TelemetryNames.MaxCoefficientZ, () => Observe(v => v.Measurements.MaxCoefficientZ), "1", "Largest |z| of a coefficient against the baseline, from the latest run that tested them.");
        meter.CreateObservableGauge(TelemetryNames.MaxPsi, () => Observe(v => v.Measurements.MaxPsi), "1", "Largest population stability index over the features, from the latest run that measured it.");
        meter.CreateObservableGauge(TelemetryNames.OpenAlerts, ObserveOpenAlerts, "{alert}", "Unresolved alerts by severity.");
        meter.CreateObservableGauge(TelemetryNames.SourceAlertOpen, () => Observe(v => v.SourceAlertOpen ? 1 : 0), "{alert}", "1 while the source check's alert is open: the model is not being watched.");
        meter.CreateObservableGauge(TelemetryNames.ConsecutiveFailures, () => Observe(v => v.ConsecutiveFailures ?? double.NaN), "{run}", "Failed runs in a row (0 after a run that read its window).");
        meter.CreateObservableGauge(TelemetryNames.DataAge, () => Observe(v => v.NewestRowTime is { } t ? (_time.GetUtcNow() - t).TotalSeconds : double.NaN), "s", "Seconds since the newest row the model's source delivered.");
        meter.CreateObservableGauge(TelemetryNames.LastRunAge, () => Observe(v => (_time.GetUtcNow() - v.LastRunAt).TotalSeconds), "s", "Seconds since the model's latest recorded run.");
        meter.CreateObservableGauge(TelemetryNames.SchedulePeriod, () => Observe(v => v.SchedulePeriod.TotalSeconds), "s", "Time between the model's schedule slots.");
    }

    /// <summary>Records a finished run.</summary>
    public void RecordRun(string model, RunStatus status, TimeSpan duration, long rowsRead, long rowsRejected, string? errorType = null)
    {
        var tags = new TagList { { TelemetryNames.ModelTag, model }, { TelemetryNames.StatusTag, status.Name() } };
        if (errorType is not null)
        {
            tags.Add(TelemetryNames.ErrorTypeTag, errorType);
        }

        _runDuration.Record(duration.TotalSeconds, tags);
        _runs.Add(1, tags);
        _rowsRead.Add(rowsRead, new KeyValuePair<string, object?>(TelemetryNames.ModelTag, model));
        if (rowsRejected > 0)
        {
            _rowsRejected.Add(rowsRejected, new KeyValuePair<string, object?>(TelemetryNames.ModelTag, model));
        }
    }

    /// <summary>Counts an alert transition.</summary>
    public void RecordAlertTransition(string model, string check, string severity, string state) =>
        _alertTransitions.Add(1, new TagList
        {
            { TelemetryNames.ModelTag, model },
            { TelemetryNames.CheckTag, check },
            { TelemetryNames.SeverityTag, severity },
            { TelemetryNames.StateTag, state },
        });

    /// <summary>Publishes a model's latest values over what it published before.</summary>
    public void Update(string model, ModelGaugeValues values) => _models.AddOrUpdate(model, values, (_, earlier) => values.Over(earlier));

    /// <summary>The values a model publishes now, or null.</summary>
    public ModelGaugeValues? Published(string model) => _models.GetValueOrDefault(model);

    /// <summary>Stops publishing a model (retired or disabled).</summary>
    public void Forget(string model) => _models.TryRemove(model, out _);

    /// <summary>Models currently published.</summary>
    public IReadOnlyCollection<string> PublishedModels => _models.Keys.ToArray();

    private IEnumerable<Measurement<double>> Observe(Func<ModelGaugeValues, double> select)
    {
        foreach ((string model, ModelGaugeValues values) in _models)
        {
            double v = select(values);
            if (double.IsFinite(v))
            {
                yield return new Measurement<double>(v, new KeyValuePair<string, object?>(TelemetryNames.ModelTag, model));
            }
        }
    }

    private IEnumerable<Measurement<int>> ObserveOpenAlerts()
    {
        foreach ((string model, ModelGaugeValues values) in _models)
        {
            yield return new Measurement<int>(values.OpenWarnings, new(TelemetryNames.ModelTag, model), new(TelemetryNames.SeverityTag, "warning"));
            yield return new Measurement<int>(values.OpenCriticals, new(TelemetryNames.ModelTag, model), new(TelemetryNames.SeverityTag, "critical"));
        }
    }
}
