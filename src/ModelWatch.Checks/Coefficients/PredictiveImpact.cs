using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// How much a set of rows' own coefficients would lower their error against the deployed ones, in reference
/// variances: <c>D = δᵀ(XᵀX/m)δ/s²_ref</c>, δ = b̂ − b0 (the drift term of the exact MSE decomposition). With no change its
/// mean is about <c>p(1/m + 1/n)</c>, pure estimation noise, which <see cref="Corrected"/> takes off so that small sets
/// do not pass the practical floor by noise alone.
/// </summary>
/// <param name="Raw">D as measured.</param>
/// <param name="Corrected">D less its mean under no change.</param>
/// <param name="Rows">Rows it was measured on.</param>
/// <param name="OnNewRows">Whether the rows were the run's new rows (else the whole window).</param>
internal sealed record PredictiveImpact(double Raw, double Corrected, long Rows, bool OnNewRows)
{
    /// <summary>The impact on the newest rows when they can be refitted on their own, else on the window.</summary>
    public static PredictiveImpact? Recent(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        int p = baseline.ToLayout().ParameterCount;
        if (input.Window.NewRows is { } fresh && fresh.RowCount > p + 1 && LeastSquaresFit.Fit(fresh) is { IsFullRank: true } freshFit)
        {
            return Of(baseline, freshFit, onNewRows: true);
        }

        return input.Window.Fit is { IsFullRank: true } fit ? Of(baseline, fit, onNewRows: false) : null;
    }

    /// <summary>The impact of a full-rank fit's coefficients against the deployed ones.</summary>
    public static PredictiveImpact Of(BaselineReference baseline, FitSummary fit, bool onNewRows)
    {
        double[] b0 = baseline.CoefficientVector();
        double[] delta = RegressionMath.Estimates(fit).Select((b, j) => b - b0[j]).ToArray();
        double m = fit.RowCount;
        double s2 = baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation;
        double raw = RegressionMath.NormSquaredOfProduct(RegressionMath.R(fit.Factor), delta) / m / s2;
        double noise = fit.ParameterCount * ((1.0 / m) + (1.0 / Math.Max(1, baseline.RowCount)));
        return new PredictiveImpact(raw, raw - noise, fit.RowCount, onNewRows);
    }
}
