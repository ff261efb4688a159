namespace ModelWatch.Checks.Summaries;

/// <summary>Reference quantile bins of one feature: inner edges (bins are <c>(−∞, e₁], (e₁, e₂], …, (e_last, ∞)</c>) and proportions.</summary>
public sealed class FeatureBins
{
    /// <summary>The feature.</summary>
    public required string Feature { get; init; }

    /// <summary>Inner bin edges, ascending and distinct (one fewer than the bins).</summary>
    public required double[] Edges { get; init; }

    /// <summary>Reference share of rows in each bin.</summary>
    public required double[] Proportions { get; init; }

    /// <summary>Rows per bin of a reference sample of <paramref name="sampleSize"/> rows, recovered from its shares.</summary>
    public long[] Counts(int sampleSize) => [.. Proportions.Select(share => (long)Math.Round(share * sampleSize))];

    /// <summary>Index of the bin holding <paramref name="value"/> (NaN falls in the last bin).</summary>
    public int BinOf(double value)
    {
        if (double.IsNaN(value))
        {
            return Edges.Length;
        }

        // The number of edges below the value, counted without branches: a binary search over a handful of edges
        // mispredicts on most rows, and this runs for every feature of every row read.
        int bin = 0;
        foreach (double edge in Edges)
        {
            bin += System.Runtime.CompilerServices.Unsafe.BitCast<bool, byte>(value > edge);
        }

        return bin;
    }
}
