using System.Collections.Concurrent;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// Spends a model's yearly false-alarm budget (methods.md §3.5.1): each of K channels gets F*/K false alarms per
/// year. A fixed-sample test runs once per non-overlapping window, so its α is F*/(K·N_w) with N_w windows a year
/// (Bonferroni over time: valid under any dependence). The CUSUM takes one step per run, so its in-control ARL
/// is K·N_runs/F* runs, and h follows from the ARL (Brook–Evans Markov chain, methods.md §3.4).
/// </summary>
public static class FalseAlarmBudget
{
    /// <summary>Hours in a mean Gregorian year.</summary>
    public const double HoursPerYear = 8765.82;

    private static readonly ConcurrentDictionary<(double Arl, double K), double> Thresholds = new();

    /// <summary>Fixed-sample tests per year: one per window, at most one per run.</summary>
    public static double TestsPerYear(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        double hours = Math.Max(thresholds.WindowLength.TotalHours, thresholds.Cadence.TotalHours);
        return HoursPerYear / hours;
    }

    /// <summary>Runs per year.</summary>
    public static double RunsPerYear(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return HoursPerYear / thresholds.Cadence.TotalHours;
    }

    /// <summary>α of each fixed-sample test.</summary>
    public static double FixedSampleAlpha(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return thresholds.AlphaOverride ?? Math.Min(0.05, thresholds.FalseAlarmsPerYear / (thresholds.AlarmChannels * TestsPerYear(thresholds)));
    }

    /// <summary>In-control ARL (in runs) the CUSUM's share of the budget allows.</summary>
    public static double CusumTargetArl(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return thresholds.AlarmChannels * RunsPerYear(thresholds) / thresholds.FalseAlarmsPerYear;
    }

    /// <summary>The CUSUM threshold h: the override, or the one whose two-sided ARL0 is <see cref="CusumTargetArl"/>.</summary>
    public static double CusumThreshold(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        if (thresholds.CusumThreshold is { } h)
        {
            return h;
        }

        double target = Math.Round(CusumTargetArl(thresholds), 3);
        return Thresholds.GetOrAdd((target, thresholds.CusumReference), key => PageCusum.ThresholdForArl(key.Arl, key.K));
    }
}
