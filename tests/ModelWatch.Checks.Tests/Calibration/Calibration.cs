using MathNet.Numerics.Distributions;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// Shared set-up of the per-run calibration simulations: 5 features, a baseline of 2,000 rows and windows of
/// 500 rows; every trial draws its own baseline and windows from a seed derived from the trial number.
/// </summary>
internal static class Calibration
{
    public const int Features = 5;
    public const int BaselineRows = 2000;
    public const int WindowRows = 500;

    /// <summary>Seed of trial <paramref name="trial"/> in a simulation identified by <paramref name="stream"/>.</summary>
    public static int Seed(int stream, int trial) => (stream * 1_000_003) + trial;

    /// <summary>The binomial 99 % central interval of rejection counts out of <paramref name="trials"/> at rate <paramref name="rate"/>.</summary>
    public static (int Low, int High) Binomial99(double rate, int trials)
    {
        int low = 0;
        while (Binomial.CDF(rate, trials, low) < 0.005)
        {
            low++;
        }

        int high = low;
        while (Binomial.CDF(rate, trials, high) < 0.995)
        {
            high++;
        }

        return (low, high);
    }

    public static Finding? Find(IEnumerable<CheckResult> results, string check, string statistic, string? subject = null) =>
        results.Where(r => r.Check == check).SelectMany(r => r.Findings).FirstOrDefault(f => f.Statistic == statistic && f.Subject == subject && !f.Skipped);
}
