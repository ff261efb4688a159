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

    /// <summary>Index of the bin holding <paramref name="value"/>.</summary>
    public int BinOf(double value)
    {
        int lo = 0;
        int hi = Edges.Length;
        while (lo < hi)
        {
            int mid = (lo + hi) >>> 1;
            if (value <= Edges[mid])
            {
                hi = mid;
            }
            else
            {
                lo = mid + 1;
            }
        }

        return lo;
    }
}
