using ModelWatch.Daemon.Runs;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// A model's values behind the per-model gauges, as its latest recorded run left them. A measurement the run did not
/// make (NaN, or a null time) keeps the value an earlier run published, so a gauge holds its last value until a run
/// replaces it instead of vanishing between the runs that measure it.
/// </summary>
/// <param name="Measurements">What the window measured (NaN where it did not).</param>
/// <param name="OpenWarnings">Unresolved warning alerts.</param>
/// <param name="OpenCriticals">Unresolved critical alerts.</param>
/// <param name="SourceAlertOpen">Whether the <c>source</c> check's alert is open: the model is not being watched.</param>
/// <param name="ConsecutiveFailures">Failed runs in a row, or null when the run did not count them.</param>
/// <param name="NewestRowTime">The newest row any run has read, or null when unknown.</param>
/// <param name="LastRunAt">When the latest run was recorded.</param>
/// <param name="SchedulePeriod">The time between the model's slots.</param>
public sealed record ModelGaugeValues(
    RunMeasurements Measurements,
    int OpenWarnings,
    int OpenCriticals,
    bool SourceAlertOpen,
    int? ConsecutiveFailures,
    DateTimeOffset? NewestRowTime,
    DateTimeOffset LastRunAt,
    TimeSpan SchedulePeriod)
{
    /// <summary>These values over <paramref name="earlier"/>: what this run did not measure keeps the earlier value.</summary>
    public ModelGaugeValues Over(ModelGaugeValues? earlier)
    {
        if (earlier is null)
        {
            return this;
        }

        RunMeasurements a = Measurements, b = earlier.Measurements;
        return this with
        {
            Measurements = new RunMeasurements(
                Keep(a.RmseRatio, b.RmseRatio), Keep(a.ConditionNumber, b.ConditionNumber), Keep(a.MaxCoefficientZ, b.MaxCoefficientZ), Keep(a.MaxPsi, b.MaxPsi)),
            ConsecutiveFailures = ConsecutiveFailures ?? earlier.ConsecutiveFailures,
            NewestRowTime = NewestRowTime is { } t && (earlier.NewestRowTime is not { } e || t >= e) ? t : earlier.NewestRowTime,
        };
    }

    private static double Keep(double latest, double earlier) => double.IsFinite(latest) ? latest : earlier;
}
