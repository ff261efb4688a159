using MathNet.Numerics.LinearAlgebra;
using ModelWatch.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Monitoring;

/// <summary>
/// One evaluation of the moving-estimates (ME) monitoring process (Chu, Hornik &amp; Kuan 1995; Leisch, Hornik &amp;
/// Kuan 2000): the least-squares estimate on a moving window of K rows against the history's estimate,
/// <c>M = K/(σ̂√n)·Q_w^{1/2}(b̂_w − b_hist)</c> with <c>Q_w = X_wᵀX_w/K</c> (strucchange's rescaled form), and the
/// coefficient-standardized components <c>z_j = K/(σ̂√n)·(b̂_w − b_hist)_j / √((Q_w⁻¹)_jj)</c>. Each <c>z_j</c> is a
/// unit-vector projection of M, so under no change it tends to the same process as any single component of M
/// (<c>W(x) − W(x − h) − h·W(1)</c>) and takes the same critical values; unlike M's components, which mix
/// coefficients through <c>Q^{1/2}</c>, it moves only with coefficient j, so a crossing names the coefficient.
/// Read off the window's factor: never the normal equations.
/// </summary>
public static class MovingEstimates
{
    /// <summary>
    /// Evaluates the process for a window's factor against the history coefficients <paramref name="history"/>
    /// (term order), the history's residual SD <paramref name="sigma"/> and row count <paramref name="historyRows"/>.
    /// Null when the window's design is singular (no estimate exists).
    /// </summary>
    public static MovingEstimatesValue? Evaluate(AugmentedFactor window, IReadOnlyList<double> history, double sigma, double historyRows)
    {
        ArgumentNullException.ThrowIfNull(window);
        ArgumentNullException.ThrowIfNull(history);
        int p = window.Layout.ParameterCount;
        if (history.Count != p)
        {
            throw new ArgumentException($"The history has {history.Count} coefficients; the window's design has {p}.", nameof(history));
        }

        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(sigma);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(historyRows);
        var r = new double[p, p];
        var c = new double[p];
        double largest = 0.0;
        for (int i = 0; i < p; i++)
        {
            for (int j = i; j < p; j++)
            {
                r[i, j] = window[i, j];
            }

            c[i] = window[i, p];
            largest = Math.Max(largest, Math.Abs(r[i, i]));
        }

        for (int i = 0; i < p; i++)
        {
            if (!(Math.Abs(r[i, i]) > Math.Max(window.RowCount, p) * Precision.MachineEpsilon * largest))
            {
                return null;
            }
        }

        double[] estimate = UpperTriangular.Solve(r, c);
        double[] inverseGram = UpperTriangular.InverseGramDiagonal(r);
        double scale = Math.Sqrt(window.RowCount) / (sigma * Math.Sqrt(historyRows));
        var delta = new double[p];
        var standardized = new double[p];
        for (int j = 0; j < p; j++)
        {
            delta[j] = estimate[j] - history[j];

            // (Q_w⁻¹)_jj = K·[(RᵀR)⁻¹]_jj.
            standardized[j] = scale * delta[j] / Math.Sqrt(inverseGram[j]);
        }

        // Q_w^{1/2}·√K = (RᵀR)^{1/2} = V·Σ·Vᵀ from the SVD R = U·Σ·Vᵀ (strucchange's root.matrix, by eigenvalues).
        var svd = Matrix<double>.Build.DenseOfArray(r).Svd(computeVectors: true);
        Matrix<double> v = svd.VT.Transpose();
        Matrix<double> root = v * Matrix<double>.Build.DiagonalOfDiagonalVector(svd.S) * svd.VT;
        Vector<double> symmetric = root * Vector<double>.Build.DenseOfArray(delta) * scale;
        return new MovingEstimatesValue(estimate, standardized, symmetric.ToArray());
    }
}
