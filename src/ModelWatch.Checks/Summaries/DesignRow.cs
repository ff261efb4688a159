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

    /// <summary>The same leverage without allocating: <paramref name="work"/> holds the solve (length p).</summary>
    public static double Leverage(double[,] r, ReadOnlySpan<double> x, Span<double> work)
    {
        int n = x.Length;
        double sum = 0.0;
        for (int i = 0; i < n; i++)
        {
            double s = x[i];
            for (int j = 0; j < i; j++)
            {
                s -= r[j, i] * work[j];
            }

            work[i] = s / r[i, i];
            sum += work[i] * work[i];
        }

        return sum;
    }
}
