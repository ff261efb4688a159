using MathNet.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Evaluation;

/// <summary>Small linear-algebra steps on factors and fits that several checks share.</summary>
internal static class RegressionMath
{
    public static double[] Estimates(FitSummary fit) => fit.Coefficients.Select(c => c.Estimate ?? double.NaN).ToArray();

    /// <summary>The p×p R block of an augmented factor.</summary>
    public static double[,] R(AugmentedFactor factor)
    {
        int p = factor.Layout.ParameterCount;
        var r = new double[p, p];
        for (int i = 0; i < p; i++)
        {
            for (int j = i; j < p; j++)
            {
                r[i, j] = factor[i, j];
            }
        }

        return r;
    }

    /// <summary><c>‖R v‖²</c>, that is <c>vᵀXᵀXv</c>, without forming XᵀX.</summary>
    public static double NormSquaredOfProduct(double[,] r, double[] v)
    {
        int p = v.Length;
        double s = 0.0;
        for (int i = 0; i < p; i++)
        {
            double a = 0.0;
            for (int j = i; j < p; j++)
            {
                a += r[i, j] * v[j];
            }

            s += a * a;
        }

        return s;
    }

    /// <summary>The factor of the union of two factors' rows (tall-skinny QR).</summary>
    public static AugmentedFactor Merge(AugmentedFactor first, AugmentedFactor second)
    {
        var accumulator = new LeastSquaresAccumulator(first.Layout);
        accumulator.Merge(first);
        accumulator.Merge(second);
        return accumulator.ToFactor();
    }

    /// <summary><c>vᵀ M⁻¹ v</c> by a Cholesky solve; NaN when M is not positive definite.</summary>
    public static double InverseQuadraticForm(double[,] m, double[] v)
    {
        Matrix<double> matrix = Matrix<double>.Build.DenseOfArray(m);
        try
        {
            var chol = matrix.Cholesky();
            Vector<double> x = chol.Solve(Vector<double>.Build.DenseOfArray(v));
            double s = 0.0;
            for (int i = 0; i < v.Length; i++)
            {
                s += v[i] * x[i];
            }

            return s;
        }
        catch (ArgumentException)
        {
            return double.NaN;
        }
    }

    /// <summary><c>xᵀ V x</c>.</summary>
    public static double QuadraticForm(double[,] v, double[] x)
    {
        double s = 0.0;
        for (int i = 0; i < x.Length; i++)
        {
            for (int j = 0; j < x.Length; j++)
            {
                s += x[i] * v[i, j] * x[j];
            }
        }

        return s;
    }

    /// <summary>The mean error <c>ȳ − x̄ᵀb</c> of coefficients <paramref name="b"/> over a factor's rows, from its column means.</summary>
    public static double MeanError(DesignLayout layout, AugmentedFactor factor, double[] b)
    {
        double[] xBar = MeanRow(layout, factor);
        return factor.Columns[layout.Features.Count].Mean - xBar.Select((x, j) => x * b[j]).Sum();
    }

    /// <summary>The mean design row (intercept first) of a factor's rows, from its column sums.</summary>
    public static double[] MeanRow(DesignLayout layout, AugmentedFactor factor)
    {
        var x = new double[layout.ParameterCount];
        int c = 0;
        if (layout.Intercept)
        {
            x[c++] = 1.0;
        }

        for (int j = 0; j < layout.Features.Count; j++)
        {
            x[c++] = factor.Columns[j].Mean;
        }

        return x;
    }
}
