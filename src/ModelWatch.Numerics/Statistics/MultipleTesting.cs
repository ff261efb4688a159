namespace ModelWatch.Numerics.Statistics;

/// <summary>Family-wise error control across several tests.</summary>
public static class MultipleTesting
{
    /// <summary>
    /// Holm (1979) step-down adjusted p-values, in the input order: <c>p̃(i) = max_{j≤i} min(1, (m − j + 1) p(j))</c>
    /// over the sorted p-values. Rejecting every test with <c>p̃ ≤ α</c> is Holm's procedure at level α, valid
    /// under any dependence. NaN p-values are left out of the family and stay NaN.
    /// </summary>
    public static double[] HolmAdjusted(IReadOnlyList<double> pValues)
    {
        ArgumentNullException.ThrowIfNull(pValues);
        int[] order = Enumerable.Range(0, pValues.Count).Where(i => !double.IsNaN(pValues[i])).OrderBy(i => pValues[i]).ToArray();
        var adjusted = new double[pValues.Count];
        Array.Fill(adjusted, double.NaN);
        int m = order.Length;
        double running = 0.0;
        for (int rank = 0; rank < m; rank++)
        {
            double candidate = Math.Min(1.0, (m - rank) * pValues[order[rank]]);
            running = Math.Max(running, candidate);
            adjusted[order[rank]] = running;
        }

        return adjusted;
    }
}
