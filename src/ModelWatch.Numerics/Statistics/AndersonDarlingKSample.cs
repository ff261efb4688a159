namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// The k-sample Anderson–Darling statistic of Scholz &amp; Stephens (1987, JASA 82:918–924): version 1 (<c>A²kN</c>,
/// right-continuous, for tied data) and the midrank version 2 (<c>A²akN</c>), with the paper's closed-form
/// variance σ_N² and the standardized statistic <c>T = (A² − (k − 1)) / σ_N</c>.
/// </summary>
public static class AndersonDarlingKSample
{
    /// <summary>The smallest significance level of Scholz &amp; Stephens' table; <see cref="PValue"/> reports it as an upper bound beyond the table.</summary>
    public const double SmallestTabulatedPValue = 0.001;

    /// <summary>Computes the statistic for two or more samples.</summary>
    public static AndersonDarlingResult Compute(IReadOnlyList<IReadOnlyList<double>> samples, bool midrank)
    {
        ArgumentNullException.ThrowIfNull(samples);
        int k = samples.Count;
        if (k < 2 || samples.Any(s => s.Count == 0))
        {
            throw new ArgumentException("The k-sample Anderson–Darling test needs at least two non-empty samples.", nameof(samples));
        }

        return ComputeSorted([.. samples.Select(SortedSample.Of)], midrank);
    }

    /// <summary>Computes the statistic for two or more samples each already sorted ascending (no NaN).</summary>
    public static AndersonDarlingResult ComputeSorted(IReadOnlyList<double[]> sortedSamples, bool midrank)
    {
        ArgumentNullException.ThrowIfNull(sortedSamples);
        int k = sortedSamples.Count;
        if (k < 2 || sortedSamples.Any(s => s.Length == 0))
        {
            throw new ArgumentException("The k-sample Anderson–Darling test needs at least two non-empty samples.", nameof(sortedSamples));
        }

        double[] z = new double[sortedSamples.Sum(s => s.Length)];
        int offset = 0;
        foreach (double[] s in sortedSamples)
        {
            s.CopyTo(z, offset);
            offset += s.Length;
        }

        Array.Sort(z);
        int bigN = z.Length;
        double a2 = midrank ? Midrank(sortedSamples, z) : RightContinuous(sortedSamples, z);
        double sigma = Math.Sqrt(Variance(sortedSamples.Select(s => s.Length).ToArray(), bigN));
        return new AndersonDarlingResult(a2, sigma, (a2 - (k - 1)) / sigma, k, bigN);
    }

    /// <summary>
    /// Approximate p-value of the standardized statistic T for k samples (the table below is typed from memory of
    /// SciPy's source; it reproduces SciPy 1.10.1's p-values for Scholz &amp; Stephens' paper-smoothness example): the quadratic in T fitted to
    /// log(significance) at Scholz &amp; Stephens' (1987) interpolated critical values
    /// <c>b₀ + b₁/√(k−1) + b₂/(k−1)</c>, the rule SciPy's <c>anderson_ksamp</c> uses. Below the table (p above 0.25) the
    /// quadratic is extrapolated; from its largest critical value on the answer is 0.001, an upper bound
    /// (<see cref="SmallestTabulatedPValue"/>, SciPy's floor too): the fitted quadratic turns upward near T = 28 for two
    /// samples and would report a p-value of 1 for an enormous T, and for k ≥ 3 it dips just below 0.001 at the table's end.
    /// </summary>
    public static double PValue(double standardized, int sampleCount)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sampleCount, 2);
        if (standardized > LargestCriticalValue(sampleCount))
        {
            return SmallestTabulatedPValue;
        }

        return Math.Max(SmallestTabulatedPValue, InterpolatedPValue(standardized, sampleCount));
    }

    /// <summary>True when T lies beyond the table's largest critical value, so <see cref="PValue"/> is an upper bound.</summary>
    public static bool BeyondTable(double standardized, int sampleCount) => standardized > LargestCriticalValue(sampleCount);

    private static double LargestCriticalValue(int sampleCount)
    {
        double m = sampleCount - 1;
        return 3.085 + (3.615 / Math.Sqrt(m)) + (-0.154 / m);
    }

    private static double InterpolatedPValue(double standardized, int sampleCount)
    {
        double[] b0 = [0.675, 1.281, 1.645, 1.96, 2.326, 2.573, 3.085];
        double[] b1 = [-0.245, 0.25, 0.678, 1.149, 1.822, 2.364, 3.615];
        double[] b2 = [-0.105, -0.305, -0.362, -0.391, -0.396, -0.345, -0.154];
        double[] significance = [0.25, 0.1, 0.05, 0.025, 0.01, 0.005, 0.001];
        double m = sampleCount - 1;
        var layout = new Regression.DesignLayout(["t", "t2"], "log_p", intercept: true);
        var accumulator = new Regression.LeastSquaresAccumulator(layout);
        for (int i = 0; i < b0.Length; i++)
        {
            double critical = b0[i] + (b1[i] / Math.Sqrt(m)) + (b2[i] / m);
            accumulator.AddRow([critical, critical * critical], Math.Log(significance[i]));
        }

        var fit = Regression.LeastSquaresFit.Fit(accumulator.ToFactor());
        double a = fit.Coefficients[0].Estimate!.Value;
        double b = fit.Coefficients[1].Estimate!.Value;
        double c = fit.Coefficients[2].Estimate!.Value;
        return Math.Min(1.0, Math.Exp(a + (b * standardized) + (c * standardized * standardized)));
    }

    private static double RightContinuous(IReadOnlyList<double[]> samples, double[] z)
    {
        double bigN = z.Length;
        double total = 0.0;
        foreach (double[] s in samples)
        {
            double inner = 0.0;
            double b = 0.0;
            var pooled = new Cursor(z);
            var own = new Cursor(s);

            // Every distinct pooled value but the largest, in ascending order.
            for (int at = 0; at < z.Length; at = pooled.Right)
            {
                double v = z[at];
                pooled.MoveTo(v);
                if (pooled.Right == z.Length)
                {
                    break;
                }

                own.MoveTo(v);
                double l = pooled.Right - pooled.Left;
                b += l;
                double mij = own.Right;
                double diff = (bigN * mij) - (b * s.Length);
                inner += l / bigN * diff * diff / (b * (bigN - b));
            }

            total += inner / s.Length;
        }

        return total;
    }

    private static double Midrank(IReadOnlyList<double[]> samples, double[] z)
    {
        double bigN = z.Length;
        double total = 0.0;
        foreach (double[] s in samples)
        {
            double inner = 0.0;
            var pooled = new Cursor(z);
            var own = new Cursor(s);
            for (int at = 0; at < z.Length; at = pooled.Right)
            {
                double v = z[at];
                pooled.MoveTo(v);
                own.MoveTo(v);
                double left = pooled.Left;
                double l = pooled.Right - left;
                double b = left + (l / 2.0);
                double right = own.Right;
                double f = right - own.Left;
                double mij = right - (f / 2.0);
                double diff = (bigN * mij) - (b * s.Length);
                inner += l / bigN * diff * diff / ((b * (bigN - b)) - (bigN * l / 4.0));
            }

            total += inner / s.Length;
        }

        return total * (bigN - 1.0) / bigN;
    }

    /// <summary>σ_N² of Scholz &amp; Stephens (1987), equation (4).</summary>
    private static double Variance(int[] sizes, int totalCount)
    {
        double k = sizes.Length;
        double bigN = totalCount;
        double bigH = sizes.Sum(n => 1.0 / n);
        double h = 0.0;
        for (int i = 1; i < totalCount; i++)
        {
            h += 1.0 / i;
        }

        // g = Σ_{i<j≤N−1} 1/((N − i) j) = Σ_{j=2}^{N−1} (1/j) Σ_{l=N−j+1}^{N−1} 1/l, accumulated in one pass.
        double g = 0.0;
        double tail = 0.0;
        for (int j = 2; j <= totalCount - 1; j++)
        {
            tail += 1.0 / (bigN - j + 1);
            g += tail / j;
        }

        double a = (((4 * g) - 6) * (k - 1)) + ((10 - (6 * g)) * bigH);
        double b = (((2 * g) - 4) * k * k) + (8 * h * k) + (((2 * g) - (14 * h) - 4) * bigH) - (8 * h) + (4 * g) - 6;
        double c = (((6 * h) + (2 * g) - 2) * k * k) + (((4 * h) - (4 * g) + 6) * k) + (((2 * h) - 6) * bigH) + (4 * h);
        double d = (((2 * h) + 6) * k * k) - (4 * h * k);
        return ((a * bigN * bigN * bigN) + (b * bigN * bigN) + (c * bigN) + d) / ((bigN - 1.0) * (bigN - 2.0) * (bigN - 3.0));
    }

    /// <summary>
    /// Walks a sorted array through ascending values: after <see cref="MoveTo"/>, <see cref="Left"/> counts the elements
    /// below the value and <see cref="Right"/> those at or below it. One pass over all values costs O(length).
    /// </summary>
    private struct Cursor(double[] sorted)
    {
        public int Left { get; private set; }

        public int Right { get; private set; }

        public void MoveTo(double value)
        {
            int left = Math.Max(Left, Right);
            while (left < sorted.Length && sorted[left] < value)
            {
                left++;
            }

            int right = left;
            while (right < sorted.Length && sorted[right] <= value)
            {
                right++;
            }

            (Left, Right) = (left, right);
        }
    }
}
