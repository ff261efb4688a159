using ModelWatch.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Summaries;

/// <summary>Small helpers that turn a source row into a design row and score it.</summary>
internal static class DesignRow
{
    /// <summary>Writes the design row (intercept first when present) of a source row holding the features first.</summary>
    public static void Fill(DesignLayout layout, ReadOnlySpan<double> source, Span<double> x)
    {
        int c = 0;
        if (layout.Intercept)
        {
            x[c++] = 1.0;
        }

        for (int j = 0; j < layout.Features.Count; j++)
        {
            x[c++] = source[j];
        }
    }

    public static double Dot(ReadOnlySpan<double> x, ReadOnlySpan<double> b)
    {
        double s = 0.0;
        for (int i = 0; i < x.Length; i++)
        {
            s += x[i] * b[i];
        }

        return s;
    }

    /// <summary>Leverage <c>xᵀ(RᵀR)⁻¹x = ‖R⁻ᵀx‖²</c> by one forward substitution.</summary>
    public static double Leverage(double[,] r, ReadOnlySpan<double> x)
    {
        double[] v = UpperTriangular.SolveTransposed(r, x);
        double s = 0.0;
        foreach (double a in v)
        {
            s += a * a;
        }

        return s;
    }

    /// <summary>
    /// The leading p×p upper triangle (R) of a factor packed column by column (column i: <c>R[0..i−1, i]</c>, then
    /// <c>R[i, i]</c>), the layout <see cref="Leverage(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{double})"/> reads
    /// in order: a rectangular array's bounds checks cost more than the arithmetic at one leverage per row read.
    /// </summary>
    public static double[] PackUpperColumns(AugmentedFactor factor, int p)
    {
        ArgumentNullException.ThrowIfNull(factor);
        var packed = new double[p * (p + 1) / 2];
        int k = 0;
        for (int i = 0; i < p; i++)
        {
            for (int j = 0; j <= i; j++)
            {
                packed[k++] = factor[j, i];
            }
        }

        return packed;
    }

    /// <summary>The same leverage from a packed R, without allocating: <paramref name="work"/> holds the solve (length p).</summary>
    public static double Leverage(ReadOnlySpan<double> packedR, ReadOnlySpan<double> x, Span<double> work)
    {
        int n = x.Length;
        double sum = 0.0;
        int k = 0;
        for (int i = 0; i < n; i++)
        {
            double s = x[i];
            for (int j = 0; j < i; j++)
            {
                s -= packedR[k++] * work[j];
            }

            work[i] = s / packedR[k++];
            sum += work[i] * work[i];
        }

        return sum;
    }
}
