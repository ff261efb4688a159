namespace ModelWatch.Numerics.LinearAlgebra;

/// <summary>Back substitution and inversion for small dense upper-triangular matrices.</summary>
public static class UpperTriangular
{
    /// <summary>Solves <c>R x = b</c> by back substitution. <paramref name="r"/> must be square and nonsingular.</summary>
    public static double[] Solve(double[,] r, ReadOnlySpan<double> b)
    {
        ArgumentNullException.ThrowIfNull(r);
        int n = r.GetLength(0);
        var x = new double[n];
        for (int i = n - 1; i >= 0; i--)
        {
            double s = b[i];
            for (int j = i + 1; j < n; j++)
            {
                s -= r[i, j] * x[j];
            }

            x[i] = s / r[i, i];
        }

        return x;
    }

    /// <summary>Solves <c>Rᵀ x = b</c> by forward substitution (used for leverages <c>‖R⁻ᵀx‖²</c>).</summary>
    public static double[] SolveTransposed(double[,] r, ReadOnlySpan<double> b)
    {
        ArgumentNullException.ThrowIfNull(r);
        int n = r.GetLength(0);
        var x = new double[n];
        for (int i = 0; i < n; i++)
        {
            double s = b[i];
            for (int j = 0; j < i; j++)
            {
                s -= r[j, i] * x[j];
            }

            x[i] = s / r[i, i];
        }

        return x;
    }

    /// <summary>
    /// The diagonal of <c>(RᵀR)⁻¹</c>, the squared row norms of <c>R⁻¹</c>: each coefficient's variance per unit of
    /// error variance, without forming <c>RᵀR</c>.
    /// </summary>
    public static double[] InverseGramDiagonal(double[,] r)
    {
        double[,] inverse = Invert(r);
        int n = inverse.GetLength(0);
        var diagonal = new double[n];
        for (int j = 0; j < n; j++)
        {
            for (int k = j; k < n; k++)
            {
                diagonal[j] += inverse[j, k] * inverse[j, k];
            }
        }

        return diagonal;
    }

    /// <summary>Returns <c>R⁻¹</c> (upper triangular) by back substitution on the identity; never forms <c>RᵀR</c>.</summary>
    public static double[,] Invert(double[,] r)
    {
        ArgumentNullException.ThrowIfNull(r);
        int n = r.GetLength(0);
        var inv = new double[n, n];
        for (int col = 0; col < n; col++)
        {
            inv[col, col] = 1.0 / r[col, col];
            for (int i = col - 1; i >= 0; i--)
            {
                double s = 0.0;
                for (int j = i + 1; j <= col; j++)
                {
                    s -= r[i, j] * inv[j, col];
                }

                inv[i, col] = s / r[i, i];
            }
        }

        return inv;
    }
}
