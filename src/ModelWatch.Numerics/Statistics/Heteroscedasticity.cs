using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Breusch–Pagan (1979) and Koenker's studentized (1981) tests of residual variance against regressors Z,
/// by an auxiliary least-squares fit through the same Householder accumulator as every other fit.
/// </summary>
public static class Heteroscedasticity
{
    /// <summary>Koenker's studentized statistic <c>LM = n·R²</c> of <c>ê²</c> on Z (plus a constant), χ²_q.</summary>
    public static StatisticalTest Koenker(IReadOnlyList<double[]> regressors, IReadOnlyList<double> residuals)
    {
        FitSummary aux = Auxiliary(regressors, residuals, scale: 1.0);
        double lm = residuals.Count * aux.RSquared;
        int q = aux.Layout.Features.Count;
        return new StatisticalTest(lm, StandardDistributions.ChiSquareUpperTail(lm, q), q);
    }

    /// <summary>The original Breusch–Pagan statistic: half the explained sum of squares of <c>ê²/σ̃²</c> on Z, σ̃² = RSS/n.</summary>
    public static StatisticalTest BreuschPagan(IReadOnlyList<double[]> regressors, IReadOnlyList<double> residuals)
    {
        ArgumentNullException.ThrowIfNull(residuals);
        double sigma2 = residuals.Sum(e => e * e) / residuals.Count;
        FitSummary aux = Auxiliary(regressors, residuals, 1.0 / sigma2);
        double ess = aux.TotalSumOfSquares - aux.ResidualSumOfSquares;
        double bp = ess / 2.0;
        int q = aux.Layout.Features.Count;
        return new StatisticalTest(bp, StandardDistributions.ChiSquareUpperTail(bp, q), q);
    }

    private static FitSummary Auxiliary(IReadOnlyList<double[]> regressors, IReadOnlyList<double> residuals, double scale)
    {
        ArgumentNullException.ThrowIfNull(regressors);
        ArgumentNullException.ThrowIfNull(residuals);
        if (regressors.Count != residuals.Count || regressors.Count == 0)
        {
            throw new ArgumentException("The auxiliary regression needs one regressor row per residual.", nameof(regressors));
        }

        int q = regressors[0].Length;
        var layout = new DesignLayout(Enumerable.Range(1, q).Select(i => "z" + i.ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray(), "squared_residual", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        for (int i = 0; i < residuals.Count; i++)
        {
            accumulator.AddRow(regressors[i], residuals[i] * residuals[i] * scale);
        }

        return LeastSquaresFit.Fit(accumulator.ToFactor());
    }
}
