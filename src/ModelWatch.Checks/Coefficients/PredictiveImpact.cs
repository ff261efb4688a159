using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// How much recent rows' own coefficients would lower their error against the deployed ones, in reference variances
/// (the drift terms of the exact MSE decomposition), each less its mean under no change (pure estimation noise), so
/// that small sets do not pass the practical floor by noise alone:
/// <list type="bullet">
/// <item><see cref="Corrected"/>: all coefficients, <c>D = δᵀ(XᵀX/m)δ/s²_ref − p(1/m + 1/n)</c>, δ = b̂ − b0;</item>
/// <item><see cref="PerCoefficient"/>: one slope alone, <c>δ_j²·var(x_j)/s²_ref</c> less its sampling variance on that
/// scale, so a named coefficient pages only when its own change matters;</item>
/// <item><see cref="Level"/>: the mean deployed error alone, <c>ē0²/s²_ref − (1/m + 1/n)</c>.</item>
/// </list>
/// </summary>
/// <param name="Corrected">D of all coefficients, less its mean under no change.</param>
/// <param name="PerCoefficient">Per term (intercept included as NaN): D of that slope alone, less its noise.</param>
/// <param name="Level">Squared mean error in reference variances, less its noise.</param>
/// <param name="Rows">Rows it was measured on.</param>
/// <param name="OnNewRows">Whether the rows were the run's new rows (else the whole window).</param>
internal sealed record PredictiveImpact(double Corrected, double[] PerCoefficient, double Level, long Rows, bool OnNewRows)
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

    /// <summary>D of all coefficients as measured, without the noise correction (the window's Wald floor uses it).</summary>
    public static double Raw(BaselineReference baseline, FitSummary fit)
    {
        double[] b0 = baseline.CoefficientVector();
        double[] delta = RegressionMath.Estimates(fit).Select((b, j) => b - b0[j]).ToArray();
        double s2 = baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation;
        return RegressionMath.NormSquaredOfProduct(RegressionMath.R(fit.Factor), delta) / fit.RowCount / s2;
    }

    /// <summary>The impacts of a full-rank fit's coefficients against the deployed ones.</summary>
    public static PredictiveImpact Of(BaselineReference baseline, FitSummary fit, bool onNewRows)
    {
        DesignLayout layout = baseline.ToLayout();
        double[] b0 = baseline.CoefficientVector();
        double[] estimates = RegressionMath.Estimates(fit);
        double m = fit.RowCount;
        double n = Math.Max(1, baseline.RowCount);
        double s2 = baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation;
        double[,]? vRef = baseline.CovarianceMatrix();
        var perCoefficient = new double[layout.ParameterCount];
        for (int j = 0; j < layout.ParameterCount; j++)
        {
            int feature = j - layout.FirstFeatureColumn;
            double sd = feature >= 0 && feature < baseline.FeatureStandardDeviations.Count ? baseline.FeatureStandardDeviations[feature] : double.NaN;
            double delta = estimates[j] - b0[j];
            double sampling = fit.Covariance[j, j] + (vRef?[j, j] ?? 0.0);
            perCoefficient[j] = feature < 0 ? double.NaN : ((delta * delta) - sampling) * sd * sd / s2;
        }

        double meanError = RegressionMath.MeanError(layout, fit.Factor, b0);
        double level = (meanError * meanError / s2) - ((1.0 / m) + (1.0 / n));
        double corrected = Raw(baseline, fit) - (layout.ParameterCount * ((1.0 / m) + (1.0 / n)));
        return new PredictiveImpact(corrected, perCoefficient, level, fit.RowCount, onNewRows);
    }
}
