using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// The coefficients check's per-run tests of the window's refit against the deployed coefficients: the Wald test
/// with both covariances, <c>W = δᵀ(V_new + V_ref)⁻¹δ</c>; Chow's (1960) test from the stored factors (it assumes equal
/// error variances, biased otherwise, Toyoda 1974, so it informs but never pages); and a z per coefficient with Holm's
/// (1979) step-down correction, which pages only when the Wald test does (the omnibus test guards the family).
/// Critical needs the run's budgeted α and the window's predictive impact D above the floor.
/// </summary>
internal static class WaldEvidence
{
    public static IEnumerable<Finding> Run(CheckInput input, FitSummary fit)
    {
        const string check = CheckNames.Coefficients;
        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        int p = layout.ParameterCount;
        double[] b0 = baseline.CoefficientVector();
        double[] bHat = RegressionMath.Estimates(fit);
        double[] delta = bHat.Select((b, j) => b - b0[j]).ToArray();
        double impact = PredictiveImpact.Raw(baseline, fit);
        double floor = input.Setting(CoefficientsCheck.DriftImpactFloor);
        bool practical = impact >= floor;
        double alpha = input.RunAlpha();
        double[,]? vRef = baseline.CovarianceMatrix();
        Severity wald = Severity.Ok;
        if (vRef is null)
        {
            yield return Skip(check, "wald", SkipReasons.BaselineIncomplete, "the baseline has no coefficient covariance (imported without it), so the Wald test cannot run; a zero covariance would alarm forever");
        }
        else
        {
            var sum = new double[p, p];
            for (int i = 0; i < p; i++)
            {
                for (int j = 0; j < p; j++)
                {
                    sum[i, j] = fit.Covariance[i, j] + vRef[i, j];
                }
            }

            double w = RegressionMath.InverseQuadraticForm(sum, delta);
            double df2 = Math.Min(baseline.ResidualDegreesOfFreedom, fit.ResidualDegreesOfFreedom);

            // W/p against F(p, min(n−p, m−p)): a conservative small-sample form of the χ²_p limit.
            double pw = StandardDistributions.FisherUpper(w / p, p, df2);
            double critical = p * StandardDistributions.FisherUpperQuantile(alpha, p, df2);
            wald = Grade(pw, alpha, input.Thresholds.WarningAlpha, practical);
            yield return new Finding
            {
                Check = check,
                Statistic = "wald",
                Value = Finite(w),
                PValue = Finite(pw),
                Alpha = alpha,
                Limit = Finite(critical),
                Severity = wald,
                EffectSize = Finite(impact),
                EffectSizeName = "predictive_impact",
                Explanation = Fmt($"all coefficients of the window's refit against the deployed ones: Wald {Num(w)} on {p} df (critical {Num(critical)} at α {Level(alpha)}), {P(pw)}; drift alone would raise the deployed model's MSE by {Pct(impact)} on the window (floor {Pct(floor)})"),
                Details = Details(("chi2_p_value", StandardDistributions.ChiSquareUpperTail(w, p)), ("df", p), ("df_denominator", df2)),
            };
        }

        yield return Chow(input, fit, layout);
        foreach (Finding f in PerCoefficient(input, layout, b0, bHat, delta, fit, vRef, alpha, wald))
        {
            yield return f;
        }
    }

    private static Finding Chow(CheckInput input, FitSummary fit, DesignLayout layout)
    {
        AugmentedFactor? reference = input.Baseline.ToFactor();
        if (reference is null)
        {
            return Skip(CheckNames.Coefficients, "chow", SkipReasons.BaselineIncomplete, "the baseline stores no reference factor, so the Chow test cannot run");
        }

        int p = layout.ParameterCount;
        AugmentedFactor pooled = RegressionMath.Merge(reference, fit.Factor);
        double rss1 = reference.ResidualSumOfSquares;
        double rss2 = fit.ResidualSumOfSquares;
        double df2 = reference.RowCount + fit.RowCount - (2.0 * p);
        double f = (pooled.ResidualSumOfSquares - rss1 - rss2) / p / ((rss1 + rss2) / df2);
        double pf = StandardDistributions.FisherUpper(f, p, df2);

        // Chow's test only informs, so its p-value is graded at the warning level, not the run's budget.
        double level = input.Thresholds.WarningAlpha;
        double critical = StandardDistributions.FisherUpperQuantile(level, p, df2);
        return new Finding
        {
            Check = CheckNames.Coefficients,
            Statistic = "chow",
            Value = Finite(f),
            PValue = Finite(pf),
            Alpha = level,
            Limit = Finite(critical),
            Severity = pf < level ? Severity.Warning : Severity.Ok,
            Explanation = Fmt($"Chow test of reference rows against this window: F({p}, {df2}) = {Num(f)} (critical {Num(critical)} at α {Level(level)}), {P(pf)} (assumes equal error variance; the Wald test and the monitors page)"),
            Details = Details(("rss_reference", rss1), ("rss_window", rss2), ("rss_pooled", pooled.ResidualSumOfSquares)),
        };
    }

    private static IEnumerable<Finding> PerCoefficient(CheckInput input, DesignLayout layout, double[] b0, double[] bHat, double[] delta, FitSummary fit, double[,]? vRef, double alpha, Severity wald)
    {
        BaselineReference baseline = input.Baseline;
        int p = layout.ParameterCount;
        double[]? seRef = vRef is not null ? Enumerable.Range(0, p).Select(j => Math.Sqrt(vRef[j, j])).ToArray() : baseline.StandardErrors;
        if (seRef is null || seRef.Any(double.IsNaN))
        {
            yield return Skip(CheckNames.Coefficients, "z", SkipReasons.BaselineIncomplete, "the baseline has no standard errors, so per-coefficient tests cannot run");
            yield break;
        }

        double[] z = new double[p];
        double[] raw = new double[p];
        for (int j = 0; j < p; j++)
        {
            z[j] = delta[j] / Math.Sqrt(fit.Covariance[j, j] + (seRef[j] * seRef[j]));
            raw[j] = StandardDistributions.NormalTwoSided(z[j]);
        }

        double[] holm = MultipleTesting.HolmAdjusted(raw);

        // Holm's step-down tests the r-th smallest raw p-value (r from 0) of the m that exist at α/(m − r): its critical
        // |z| at that step (a coefficient without a p-value is outside the family, as in HolmAdjusted).
        int[] order = [.. Enumerable.Range(0, p).Where(j => !double.IsNaN(raw[j])).OrderBy(j => raw[j])];
        double[] critical = [.. Enumerable.Repeat(double.NaN, p)];
        for (int r = 0; r < order.Length; r++)
        {
            critical[order[r]] = StandardDistributions.NormalUpperQuantile(alpha / (2.0 * (order.Length - r)));
        }

        for (int j = 0; j < p; j++)
        {
            string term = layout.Terms[j];
            int feature = j - layout.FirstFeatureColumn;
            double sdX = feature < 0 ? 1.0 : feature < baseline.FeatureStandardDeviations.Count ? baseline.FeatureStandardDeviations[feature] : double.NaN;

            // Change in y, in residual SDs, per SD of the feature.
            double effect = delta[j] * sdX / baseline.ResidualStandardDeviation;
            Severity severity = holm[j] < alpha ? (wald == Severity.Critical ? Severity.Critical : Severity.Warning)
                : holm[j] < input.Thresholds.WarningAlpha ? Severity.Warning
                : Severity.Ok;
            yield return new Finding
            {
                Check = CheckNames.Coefficients,
                Subject = term,
                Statistic = "z",
                Value = Finite(z[j]),
                PValue = Finite(holm[j]),
                Alpha = alpha,
                Limit = Finite(critical[j]),
                Severity = severity,
                EffectSize = Finite(effect),
                EffectSizeName = "outcome_sd_per_feature_sd",
                Explanation = Fmt($"coefficient of {term} on the window's refit moved from {Num(b0[j])} to {Num(bHat[j])}: z = {Num(z[j])} standard errors (Holm's critical |z| at its step {Num(critical[j])}), {P(holm[j])} after Holm, α {Level(alpha)}"),
                Details = Details(("baseline", b0[j]), ("refit", bHat[j]), ("raw_p_value", raw[j])),
            };
        }
    }
}
