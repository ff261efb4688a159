namespace ModelWatch.Numerics.Statistics;

/// <summary>Sorted copies of samples, for the rank tests that take their input already sorted.</summary>
public static class SortedSample
{
    /// <summary>A new array with the values in ascending order; the input is left as it was.</summary>
    public static double[] Of(IReadOnlyList<double> values)
    {
        ArgumentNullException.ThrowIfNull(values);
        double[] sorted = [.. values];
        Array.Sort(sorted);
        return sorted;
    }
}
