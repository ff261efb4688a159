using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>coefficients</c> (methods.md §2): the window's refit against the deployed coefficients. The alarm statistic
/// is the Wald test with both covariances; Chow's test (from the stored factors) is reported beside it; each
/// coefficient gets a z test with Holm's correction. Critical needs budgeted significance and a predictive impact
/// <c>D = δᵀSδ/s²_ref</c> above the floor. Uses the refit on the window's rows (single pass).
/// </summary>
public static class CoefficientsCheck
{
    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Coefficients;
        CheckState state = input.CurrentState;
        if (!input.FixedSampleDue)
        {
            return NotDue(check, state, "wald", "the coefficient tests run");
        }

        FitSummary? fit = input.Window.Fit;
        CheckState next = state with { LastTestedWindowEnd = input.WindowEnd };
        if (fit is null || !fit.IsFullRank || fit.ResidualDegreesOfFreedom <= 0)
        {
            string why = fit?.RankDeficiency is { } rd ? "the window's refit lost rank (" + string.Join(", ", rd.AliasedTerms) + ")" : "the window has too few rows to refit";
            return new CheckResult { Check = check, State = next, Findings = [Skip(check, "wald", SkipReasons.RankDeficient, why + "; coefficients cannot be compared")] };
        }

        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        int p = layout.ParameterCount;
        double[] b0 = baseline.CoefficientVector();
        double[] bHat = RegressionMath.Estimates(fit);
        double[] delta = bHat.Select((b, j) => b - b0[j]).ToArray();
        double m = input.Window.RowsAccepted;
        double s2Ref = baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation;
        double impact = RegressionMath.NormSquaredOfProduct(RegressionMath.R(fit.Factor), delta) / m / s2Ref;
        bool practical = impact >= input.Thresholds.DriftImpactFloor;
        double alpha = input.Alpha;
        var findings = new List<Finding>();
        double[,]? vRef = baseline.CovarianceMatrix();
        if (vRef is null)
        {
            findings.Add(Skip(check, "wald", SkipReasons.BaselineIncomplete, "the baseline has no coefficient covariance (imported without it), so the Wald test cannot run; a zero covariance would alarm forever"));
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

            // W/p against F(p, min(n−p, m−p)): the conservative small-sample form of the χ²_p limit (methods.md §2.3).
            double pw = StandardDistributions.FisherUpper(w / p, p, df2);
            Severity severity = Grade(pw, alpha, input.Thresholds.WarningAlpha, practical);
            findings.Add(new Finding
            {
                Check = check,
                Statistic = "wald",
                Value = Finite(w),
                PValue = Finite(pw),
                Threshold = alpha,
                Severity = severity,
                EffectSize = Finite(impact),
                EffectSizeName = "predictive_impact",
                Explanation = Fmt($"all coefficients against the deployed ones: Wald {Num(w)} on {p} df, {P(pw)}; drift alone would raise the deployed model's MSE by {Pct(impact)} (floor {Pct(input.Thresholds.DriftImpactFloor)})"),
                Details = Details(("chi2_p_value", StandardDistributions.ChiSquareUpperTail(w, p)), ("df", p), ("df_denominator", df2)),
            });
        }

        findings.Add(Chow(input, fit, layout, alpha));
        findings.AddRange(PerCoefficient(input, layout, b0, bHat, delta, fit, vRef, alpha, practical));
        return new CheckResult { Check = check, State = next, Findings = findings };
    }

    private static Finding Chow(CheckInput input, FitSummary fit, DesignLayout layout, double alpha)
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

        // Chow assumes equal error variances (biased otherwise, Toyoda 1974), so it informs but never pages: Wald is the alarm.
        return new Finding
        {
            Check = CheckNames.Coefficients,
            Statistic = "chow",
            Value = Finite(f),
            PValue = Finite(pf),
            Threshold = alpha,
            Severity = pf < input.Thresholds.WarningAlpha ? Severity.Warning : Severity.Ok,
            Explanation = Fmt($"Chow test of reference rows against this window: F({p}, {df2}) = {Num(f)}, {P(pf)} (assumes equal error variance; the Wald test is the alarm)"),
            Details = Details(("rss_reference", rss1), ("rss_window", rss2), ("rss_pooled", pooled.ResidualSumOfSquares)),
        };
    }

    private static IEnumerable<Finding> PerCoefficient(CheckInput input, DesignLayout layout, double[] b0, double[] bHat, double[] delta, FitSummary fit, double[,]? vRef, double alpha, bool practical)
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
        for (int j = 0; j < p; j++)
        {
            string term = layout.Terms[j];
            int feature = j - layout.FirstFeatureColumn;
            double sdX = feature < 0 ? 1.0 : feature < baseline.FeatureStandardDeviations.Count ? baseline.FeatureStandardDeviations[feature] : double.NaN;

            // Change in y, in residual SDs, per SD of the feature (methods.md §2.4).
            double effect = delta[j] * sdX / baseline.ResidualStandardDeviation;
            yield return new Finding
            {
                Check = CheckNames.Coefficients,
                Subject = term,
                Statistic = "z",
                Value = Finite(z[j]),
                PValue = Finite(holm[j]),
                Threshold = alpha,
                Severity = Grade(holm[j], alpha, input.Thresholds.WarningAlpha, practical),
                EffectSize = Finite(effect),
                EffectSizeName = "outcome_sd_per_feature_sd",
                Explanation = Fmt($"coefficient of {term} moved from {Num(b0[j])} to {Num(bHat[j])}: {Num(Math.Abs(z[j]))} standard errors, {P(holm[j])} after Holm"),
                Details = Details(("baseline", b0[j]), ("refit", bHat[j]), ("raw_p_value", raw[j])),
            };
        }
    }
}
