using System.Globalization;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Randomness;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Collinearity;

/// <summary>
/// How much VIFs and the scaled condition number of m rows vary by chance when nothing has changed: rows resampled,
/// with replacement, from the baseline's reference sample, refitted <see cref="Resamples"/> times; kept as the mean
/// and SD of the statistics' logarithms, so a window's value becomes <c>z = (log x − mean)/SD</c> and, taking the log
/// as normal in the tail, a p-value. Above <see cref="SimulatedRows"/> rows the spread is simulated at that size and
/// scaled by <c>√(size/m)</c>, the large-sample rate. Computed once per baseline and size (two significant digits).
/// </summary>
internal sealed class CollinearityNull
{
    /// <summary>Resampled sets per size.</summary>
    public const int Resamples = 120;

    /// <summary>Largest set simulated; larger sizes scale its spread.</summary>
    public const int SimulatedRows = 1500;

    /// <summary>Resampling seed, so every process and every run gets the same spread for a baseline and size.</summary>
    private const ulong Seed = 20261202;

    private CollinearityNull(double[] meanLogVif, double[] sdLogVif, double meanLogCondition, double sdLogCondition)
    {
        MeanLogVif = meanLogVif;
        SdLogVif = sdLogVif;
        MeanLogCondition = meanLogCondition;
        SdLogCondition = sdLogCondition;
    }

    /// <summary>Mean of log VIF per feature.</summary>
    public double[] MeanLogVif { get; }

    /// <summary>SD of log VIF per feature.</summary>
    public double[] SdLogVif { get; }

    /// <summary>Mean of the log scaled condition number.</summary>
    public double MeanLogCondition { get; }

    /// <summary>SD of the log scaled condition number.</summary>
    public double SdLogCondition { get; }

    /// <summary>The spread for m rows, or null when the baseline holds no reference sample to resample.</summary>
    public static CollinearityNull? For(BaselineReference baseline, long rows)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        int q = baseline.Features.Count;
        if (q == 0 || baseline.FeatureSamples.Count != q || baseline.SampleSize < 20 || rows < 2)
        {
            return null;
        }

        long size = TwoDigits(rows);
        return baseline.Derived("collinearity-null:" + size.ToString(CultureInfo.InvariantCulture), b => Simulate(b, size));
    }

    /// <summary>P(statistic ≥ value) under the fitted normal tail of its logarithm.</summary>
    public static double UpperTail(double value, double meanLog, double sdLog)
    {
        if (!(value > 0) || double.IsNaN(meanLog))
        {
            return double.NaN;
        }

        double log = Math.Log(value);
        return sdLog > 0 ? Numerics.Statistics.StandardDistributions.NormalUpperTail((log - meanLog) / sdLog) : log > meanLog ? 0.0 : 1.0;
    }

    private static CollinearityNull Simulate(BaselineReference baseline, long rows)
    {
        DesignLayout layout = baseline.ToLayout();
        int q = baseline.Features.Count;
        int n = baseline.SampleSize;
        int size = (int)Math.Min(rows, SimulatedRows);
        var random = new Xoshiro256(Xoshiro256.Substream(Seed, (ulong)size));
        var logVif = new double[q][];
        var logCondition = new List<double>(Resamples);
        for (int j = 0; j < q; j++)
        {
            logVif[j] = new double[Resamples];
        }

        var x = new double[q];
        int kept = 0;
        for (int r = 0; r < Resamples; r++)
        {
            var accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.RejectRow);
            for (int i = 0; i < size; i++)
            {
                int pick = random.NextInt(n);
                for (int j = 0; j < q; j++)
                {
                    x[j] = baseline.FeatureSamples[j][pick];
                }

                // Any outcome will do: VIFs and the condition number depend on the design alone.
                accumulator.AddRow(x, baseline.ResidualSample.Count > pick ? baseline.ResidualSample[pick] : 0.0);
            }

            FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
            if (!fit.IsFullRank)
            {
                continue;
            }

            for (int j = 0; j < q; j++)
            {
                logVif[j][kept] = Math.Log(fit.VarianceInflationFactors.TryGetValue(layout.Features[j], out double v) && v >= 1.0 ? v : 1.0);
            }

            logCondition.Add(Math.Log(fit.ConditionNumber));
            kept++;
        }

        double scale = rows > size ? Math.Sqrt((double)size / rows) : 1.0;
        double shrink = rows > size ? (double)size / rows : 1.0;
        var meanVif = new double[q];
        var sdVif = new double[q];
        for (int j = 0; j < q; j++)
        {
            (double mean, double sd) = MeanSd(logVif[j].AsSpan(0, kept));
            double population = Math.Log(baseline.VarianceInflationFactors.TryGetValue(layout.Features[j], out double v) && v >= 1.0 ? v : Math.Exp(mean));

            // Beyond the simulated size the sampling bias shrinks like 1/m and the spread like 1/√m.
            meanVif[j] = population + ((mean - population) * shrink);
            sdVif[j] = sd * scale;
        }

        (double meanCondition, double sdCondition) = MeanSd(logCondition.ToArray());
        double populationCondition = baseline.ConditionNumber is { } c && c > 0 ? Math.Log(c) : meanCondition;
        return new CollinearityNull(meanVif, sdVif, populationCondition + ((meanCondition - populationCondition) * shrink), sdCondition * scale);
    }

    private static (double Mean, double Sd) MeanSd(ReadOnlySpan<double> values)
    {
        if (values.Length < 2)
        {
            return (double.NaN, double.NaN);
        }

        double mean = 0.0;
        foreach (double v in values)
        {
            mean += v;
        }

        mean /= values.Length;
        double ss = 0.0;
        foreach (double v in values)
        {
            ss += (v - mean) * (v - mean);
        }

        return (mean, Math.Sqrt(ss / (values.Length - 1)));
    }

    private static long TwoDigits(long rows)
    {
        if (rows < 100)
        {
            return rows;
        }

        double magnitude = Math.Pow(10, Math.Floor(Math.Log10(rows)) - 1);
        return (long)(Math.Round(rows / magnitude) * magnitude);
    }
}
