using System.Collections.Concurrent;
using System.Diagnostics;
using System.Diagnostics.Metrics;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The daemon's instruments, created once from <see cref="IMeterFactory"/> (so tests get isolated meters).
/// Per-model values are observable gauges over a snapshot: a model that is retired or disabled is
/// <see cref="Forget">forgotten</see> and disappears from the next collection, instead of exporting its last
/// value forever as a synchronous gauge would.
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

    /// <summary>Creates the meter and its instruments.</summary>
    public ModelWatchMetrics(IMeterFactory meterFactory)
    {
        ArgumentNullException.ThrowIfNull(meterFactory);
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
        meter.CreateObservableGauge(TelemetryNames.RmseRatio, () => Observe(v => v.RmseRatio), "1", "Deployed model RMSE on the latest window over the baseline residual SD.");
        meter.CreateObservableGauge(TelemetryNames.ConditionNumber, () => Observe(v => v.ConditionNumber), "1", "Scaled condition number of the latest window's design.");
        meter.CreateObservableGauge(TelemetryNames.MaxCoefficientZ, () => Observe(v => v.MaxCoefficientZ), "1", "Largest |z| of a coefficient against the baseline.");
        meter.CreateObservableGauge(TelemetryNames.MaxPsi, () => Observe(v => v.MaxPsi), "1", "Largest population stability index over the features.");
        meter.CreateObservableGauge(TelemetryNames.OpenAlerts, ObserveOpenAlerts, "{alert}", "Unresolved alerts by severity.");
    }

    /// <summary>Records a finished run.</summary>
    public void RecordRun(string model, string status, TimeSpan duration, long rowsRead, long rowsRejected, string? errorType = null)
    {
        var tags = new TagList { { TelemetryNames.ModelTag, model }, { TelemetryNames.StatusTag, status } };
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

    /// <summary>Publishes a model's latest values.</summary>
    public void Update(string model, ModelGaugeValues values) => _models[model] = values;

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
