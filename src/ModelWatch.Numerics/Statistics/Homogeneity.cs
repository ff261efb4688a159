namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Pearson's (1900) chi-square test that two samples share one distribution over the same bins: the 2×B
/// contingency table of their counts, with <c>X² = Σ (O − E)²/E</c> on (B' − 1) degrees of freedom, B' the bins
/// either sample uses. It needs no logarithm of an empty bin's share, so it stays calibrated where a divergence such
/// as the population stability index, with its floored proportions, does not.
/// </summary>
public static class Homogeneity
{
    /// <summary>X², its degrees of freedom and the χ² upper-tail p-value.</summary>
    public static (double ChiSquare, int DegreesOfFreedom, double PValue) Pearson(IReadOnlyList<long> first, IReadOnlyList<long> second)
    {
        ArgumentNullException.ThrowIfNull(first);
        ArgumentNullException.ThrowIfNull(second);
        if (first.Count != second.Count)
        {
            throw new ArgumentException("Both samples must be counted over the same bins.", nameof(second));
        }

        double a = first.Sum();
        double b = second.Sum();
        double total = a + b;
        double chi2 = 0.0;
        int used = 0;
        for (int i = 0; i < first.Count; i++)
        {
            double column = first[i] + second[i];
            if (column == 0)
            {
                continue;
            }

            used++;
            double ea = a * column / total;
            double eb = b * column / total;
            chi2 += ((first[i] - ea) * (first[i] - ea) / ea) + ((second[i] - eb) * (second[i] - eb) / eb);
        }

        int df = Math.Max(1, used - 1);
        return (chi2, df, StandardDistributions.ChiSquareUpperTail(chi2, df));
    }
}
