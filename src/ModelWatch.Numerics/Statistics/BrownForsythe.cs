namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Brown–Forsythe (1974, JASA 69:364–367) test of equal spread in two groups: the one-way ANOVA F on the
/// absolute deviations from each group's median, <c>F(1, n₁ + n₂ − 2)</c>. Robust to heavy tails, unlike the
/// variance-ratio F.
/// </summary>
public static class BrownForsythe
{
    /// <summary>Tests whether two samples have the same spread.</summary>
    public static StatisticalTest TwoSample(IReadOnlyList<double> first, IReadOnlyList<double> second) => Compare(first, second).Test;

    /// <summary>
    /// The test and the spread ratio (see <see cref="SpreadRatio"/>) together, each sample's median and deviations
    /// computed once for both.
    /// </summary>
    public static (StatisticalTest Test, double SpreadRatio) Compare(IReadOnlyList<double> first, IReadOnlyList<double> second)
    {
        ArgumentNullException.ThrowIfNull(first);
        ArgumentNullException.ThrowIfNull(second);
        if (first.Count < 2 || second.Count < 2)
        {
            throw new ArgumentException("The Brown–Forsythe test needs at least two values in each group.");
        }

        double[] z1 = Deviations(first);
        double[] z2 = Deviations(second);
        double n1 = z1.Length;
        double n2 = z2.Length;
        double m1 = z1.Average();
        double m2 = z2.Average();
        double grand = ((m1 * n1) + (m2 * n2)) / (n1 + n2);
        double between = (n1 * (m1 - grand) * (m1 - grand)) + (n2 * (m2 - grand) * (m2 - grand));
        double within = z1.Sum(v => (v - m1) * (v - m1)) + z2.Sum(v => (v - m2) * (v - m2));
        double df2 = n1 + n2 - 2.0;
        double f = within > 0 ? between / (within / df2) : double.NaN;
        return (new StatisticalTest(f, StandardDistributions.FisherUpper(f, 1.0, df2), 1.0, df2), m2 / m1);
    }

    /// <summary>Ratio of mean absolute deviations from the median, second over first (an effect size for spread).</summary>
    public static double SpreadRatio(IReadOnlyList<double> first, IReadOnlyList<double> second) =>
        Deviations(second).Average() / Deviations(first).Average();

    private static double[] Deviations(IReadOnlyList<double> values)
    {
        double median = EmpiricalQuantile.Median(values);
        return values.Select(v => Math.Abs(v - median)).ToArray();
    }
}
