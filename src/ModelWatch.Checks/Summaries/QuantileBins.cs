using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Summaries;

/// <summary>Reference quantile bins of one feature's sample (deciles by default).</summary>
internal static class QuantileBins
{
    /// <summary>Type-7 quantile edges at b/B (ties merged, so a discrete feature gets fewer bins) and the sample's shares.</summary>
    public static FeatureBins Of(string feature, double[] values, int binCount)
    {
        double[] sorted = values.OrderBy(v => v).ToArray();
        var edges = new List<double>();
        for (int b = 1; b < binCount; b++)
        {
            double edge = EmpiricalQuantile.OfSorted(sorted, (double)b / binCount);
            if (edges.Count == 0 || edge > edges[^1])
            {
                edges.Add(edge);
            }
        }

        var bins = new FeatureBins { Feature = feature, Edges = [.. edges], Proportions = new double[edges.Count + 1] };
        foreach (double v in values)
        {
            bins.Proportions[bins.BinOf(v)] += 1.0 / values.Length;
        }

        return bins;
    }
}
