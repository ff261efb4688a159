namespace ModelWatch.Numerics.Statistics;

/// <summary>Sample quantiles by linear interpolation between order statistics (Hyndman &amp; Fan type 7, R's default).</summary>
public static class EmpiricalQuantile
{
    /// <summary>The sample median.</summary>
    public static double Median(IReadOnlyList<double> values) => Quantile(values, 0.5);

    /// <summary>The type-7 quantile of an unsorted sample.</summary>
    public static double Quantile(IReadOnlyList<double> values, double probability)
    {
        ArgumentNullException.ThrowIfNull(values);
        double[] sorted = [.. values];
        Array.Sort(sorted);
        return OfSorted(sorted, probability);
    }

    /// <summary>The type-7 quantile of a sorted sample.</summary>
    public static double OfSorted(ReadOnlySpan<double> sorted, double probability)
    {
        if (sorted.Length == 0)
        {
            return double.NaN;
        }

        double h = (sorted.Length - 1) * Math.Clamp(probability, 0.0, 1.0);
        int lo = (int)Math.Floor(h);
        int hi = Math.Min(lo + 1, sorted.Length - 1);
        return sorted[lo] + ((h - lo) * (sorted[hi] - sorted[lo]));
    }
}
