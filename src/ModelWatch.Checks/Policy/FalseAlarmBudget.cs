using System.Collections.Concurrent;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// Spends a model's yearly false-alarm budget F* over K alarm channels, F*/K each, whatever the ratio of window to
/// cadence:
/// <list type="bullet">
/// <item>a per-run test runs on every run's window, overlapping or not, at <c>α = F*/(K·N_runs)</c> with N_runs runs a
/// year: Bonferroni over the runs of a model-year, valid under any dependence between overlapping windows;</item>
/// <item>a CUSUM steps on the rows new since the previous run (independent increments), with h whose in-control ARL is
/// <c>K·N_runs/F*</c> runs (Brook–Evans Markov chain);</item>
/// <item>a structural-change monitor crosses its boundary within an epoch with probability <c>F*/K</c> times the epoch's part
/// of a year, and restarts when the epoch ends.</item>
/// </list>
/// Several tests sharing a channel split its share equally (Bonferroni).
/// </summary>
public static class FalseAlarmBudget
{
    /// <summary>Hours in a mean Gregorian year.</summary>
    public const double HoursPerYear = 8765.82;

    private static readonly ConcurrentDictionary<(double Arl, double K, bool OneSided), double> Thresholds = new();

    /// <summary>Channels the budget is split over: the override, else every registered check's.</summary>
    public static int Channels(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return thresholds.AlarmChannels ?? CheckRegistry.Channels.Count;
    }

    /// <summary>Runs per year.</summary>
    public static double RunsPerYear(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return HoursPerYear / thresholds.Cadence.TotalHours;
    }

    /// <summary>False critical alerts per year one channel may raise, F*/K.</summary>
    public static double ChannelShare(CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        return thresholds.FalseAlarmsPerYear / Channels(thresholds);
    }

    /// <summary>α of one of <paramref name="tests"/> per-run tests sharing a channel, on every run.</summary>
    public static double RunAlpha(CheckThresholds thresholds, int tests = 1)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        ArgumentOutOfRangeException.ThrowIfLessThan(tests, 1);
        return thresholds.AlphaOverride ?? Math.Min(0.05, ChannelShare(thresholds) / (tests * RunsPerYear(thresholds)));
    }

    /// <summary>In-control ARL, in runs, of one of <paramref name="cusums"/> CUSUMs sharing a channel.</summary>
    public static double CusumTargetArl(CheckThresholds thresholds, int cusums = 1)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        ArgumentOutOfRangeException.ThrowIfLessThan(cusums, 1);
        return cusums * RunsPerYear(thresholds) / ChannelShare(thresholds);
    }

    /// <summary>The threshold h of one of <paramref name="cusums"/> CUSUMs sharing a channel (the override, else solved from the ARL).</summary>
    public static double CusumThreshold(CheckThresholds thresholds, int cusums = 1, bool oneSided = false)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        if (thresholds.CusumThreshold is { } h)
        {
            return h;
        }

        double target = Math.Round(CusumTargetArl(thresholds, cusums), 3);
        return Thresholds.GetOrAdd((target, thresholds.CusumReference, oneSided), key => PageCusum.ThresholdForArl(key.Arl, key.K, key.OneSided));
    }

    /// <summary>
    /// Runs in one epoch of the moving-window monitors, whose window holds <paramref name="window"/> history lengths and
    /// spans <paramref name="runsPerWindow"/> runs: until the monitoring time <c>1 + rows/n</c> reaches e, so the
    /// boundary <c>c·√(2·log₊ x)</c> stays flat and a change late in the epoch is seen as soon as one early in it; at most
    /// a year of runs.
    /// </summary>
    public static int EpochRuns(CheckThresholds thresholds, double window, int runsPerWindow)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        double rowsPerRun = window / runsPerWindow;
        double runs = Math.Ceiling((Math.E - 1.0) / rowsPerRun);
        return (int)Math.Clamp(runs, 1.0, Math.Round(RunsPerYear(thresholds)));
    }

    /// <summary>
    /// Size, over one epoch of <paramref name="epochRuns"/> runs, of one of <paramref name="monitors"/> monitors sharing a
    /// channel: the channel's yearly share times the epoch's part of a year (a union bound over the year's epochs).
    /// </summary>
    public static double EpochAlpha(CheckThresholds thresholds, int epochRuns, int monitors = 1)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        ArgumentOutOfRangeException.ThrowIfLessThan(epochRuns, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(monitors, 1);
        return thresholds.AlphaOverride ?? Math.Min(0.5, ChannelShare(thresholds) * Math.Min(1.0, epochRuns / RunsPerYear(thresholds)) / monitors);
    }
}
