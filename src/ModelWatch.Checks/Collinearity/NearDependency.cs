using MathNet.Numerics.LinearAlgebra;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Collinearity;

/// <summary>
/// Belsley–Kuh–Welsch condition indices and variance-decomposition proportions of a design, from the SVD of its
/// R factor with unit-length columns (intercept included, not centred; Belsley, Kuh &amp; Welsch 1980).
/// </summary>
/// <param name="ConditionIndices">η_k = μ_max/μ_k, ascending.</param>
/// <param name="Proportions">π[k][j]: share of Var(b_j) tied to component k (rows follow <see cref="ConditionIndices"/>).</param>
public sealed record NearDependency(double[] ConditionIndices, double[][] Proportions)
{
    /// <summary>Computes the diagnostics of a full-rank factor.</summary>
    public static NearDependency Of(AugmentedFactor factor)
    {
        ArgumentNullException.ThrowIfNull(factor);
        double[,] r = RegressionMath.R(factor);
        int p = r.GetLength(0);
        for (int j = 0; j < p; j++)
        {
            double norm = 0.0;
            for (int i = 0; i <= j; i++)
            {
                norm += r[i, j] * r[i, j];
            }

            norm = Math.Sqrt(norm);
            for (int i = 0; i <= j; i++)
            {
                r[i, j] /= norm;
            }
        }

        var svd = Matrix<double>.Build.DenseOfArray(r).Svd(computeVectors: true);
        double[] mu = svd.S.ToArray();
        Matrix<double> v = svd.VT.Transpose();
        var phi = new double[p, p];
        var totals = new double[p];
        for (int j = 0; j < p; j++)
        {
            for (int k = 0; k < p; k++)
            {
                phi[k, j] = v[j, k] * v[j, k] / (mu[k] * mu[k]);
                totals[j] += phi[k, j];
            }
        }

        double[] indices = mu.Select(s => mu[0] / s).ToArray();
        double[][] proportions = Enumerable.Range(0, p).Select(k => Enumerable.Range(0, p).Select(j => phi[k, j] / totals[j]).ToArray()).ToArray();
        return new NearDependency(indices, proportions);
    }
}
