using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>residuals</c> (methods.md §5). On each non-overlapping window: the bias t of the deployed coefficients (every
/// row, including the baseline's own uncertainty), Brown–Forsythe spread and Kolmogorov–Smirnov distribution of
/// the standardized deployed errors against the reference residual sample (reservoir rows), Koenker's
/// Breusch–Pagan on the refit's residuals (reservoir rows) relative to baseline, and serial correlation of the
/// deployed errors in row order. On every run: the sequential CUSUM (<see cref="ResidualCusum"/>).
/// </summary>
public static class ResidualsCheck
{
    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        (IReadOnlyList<Finding> sequential, CheckState next) = ResidualCusum.StepBoth(input, state);
        var findings = new List<Finding>(sequential);
        if (!input.FixedSampleDue)
        {
            findings.Add(Skip(CheckNames.Residuals, "bias_t", SkipReasons.NotDue, "window overlaps the last tested window; the fixed-sample residual tests run on the next non-overlapping window"));
            return new CheckResult { Check = CheckNames.Residuals, State = next, Findings = findings };
        }

        findings.Add(Bias(input));
        findings.Add(Spread(input));
        findings.Add(VarianceRatio(input));
        findings.Add(Distribution(input));
        findings.Add(Tails(input));
        findings.Add(ResidualVarianceAgainstFeatures(input));
        findings.Add(Serial(input));
        return new CheckResult { Check = CheckNames.Residuals, State = next with { LastTestedWindowEnd = input.WindowEnd }, Findings = findings };
    }

    private static Finding Bias(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        double[,]? vRef = baseline.CovarianceMatrix();
        if (vRef is null || window.Factor is null)
        {
            return Skip(CheckNames.Residuals, "bias_t", SkipReasons.BaselineIncomplete, "the baseline has no coefficient covariance, so the bias test cannot include its uncertainty and does not run");
        }

        double m = window.RowsAccepted;
        double s = baseline.ResidualStandardDeviation;
        double bias = window.DeployedErrorSum / m;
        double[] xBar = RegressionMath.MeanRow(baseline.ToLayout(), window.Factor);

        // Var(ē0) = σ²/m + x̄ᵀV_ref x̄: the second term keeps large windows from flagging b0's own error (methods.md §5.1).
        double se = Math.Sqrt((s * s / m) + RegressionMath.QuadraticForm(vRef, xBar));
        double t = bias / se;
        double p = StandardDistributions.StudentTTwoSided(t, baseline.ResidualDegreesOfFreedom);
        double effect = bias / s;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "bias_t",
            Value = Finite(t),
            PValue = Finite(p),
            Threshold = input.Alpha,
            Severity = Grade(p, input.Alpha, input.Thresholds.WarningAlpha, Math.Abs(effect) >= input.Thresholds.BiasFloor),
            EffectSize = Finite(effect),
            EffectSizeName = "bias_in_reference_sd",
            Explanation = Fmt($"deployed predictions are off by {Num(bias)} on average ({Num(effect)} reference SDs, floor {Num(input.Thresholds.BiasFloor)}): t = {Num(t)}, {P(p)}"),
            Details = Details(("bias", bias), ("standard_error", se)),
        };
    }

    private static Finding Spread(CheckInput input)
    {
        if (!HasSamples(input, out Finding? skip, "brown_forsythe"))
        {
            return skip!;
        }

        IReadOnlyList<double> reference = input.Baseline.ResidualSample;
        double[] now = input.Window.ResidualSample;
        (StatisticalTest test, double ratio) = BrownForsythe.Compare(reference, now);

        // The floor is on the variance scale (methods.md §3.5.3), so the spread ratio is squared.
        bool practical = ratio * ratio < input.Thresholds.SpreadRatioLow || ratio * ratio > input.Thresholds.SpreadRatioHigh;

        // The spread channel holds two tests (this and the variance ratio), so each gets half its α (Bonferroni).
        double alpha = input.Alpha / 2.0;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "brown_forsythe",
            Value = Finite(test.Statistic),
            PValue = Finite(test.PValue),
            Threshold = alpha,
            Severity = Grade(test.PValue, alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(ratio),
            EffectSizeName = "spread_ratio",
            Explanation = Fmt($"residual spread is {Num(ratio)}× the reference (variance ×{Num(ratio * ratio)}; practical outside {Num(input.Thresholds.SpreadRatioLow)}–{Num(input.Thresholds.SpreadRatioHigh)}): Brown–Forsythe F = {Num(test.Statistic)}, {P(test.PValue)}"),
        };
    }

    private static Finding VarianceRatio(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        if (window.Fit is not { IsFullRank: true } fit || fit.ResidualDegreesOfFreedom < 2 || !HasSamples(input, out _, "variance_ratio"))
        {
            return Skip(CheckNames.Residuals, "variance_ratio", SkipReasons.InsufficientData, "no full-rank refit with residual samples, so the variance ratio cannot be tested");
        }

        // log(s²_new/s²_ref) with the large-sample variance (κ − 1)(1/df_new + 1/df_ref), κ the pooled residual kurtosis
        // (Box 1953; Layard 1973 [M]): as powerful as the F test under normal errors, and still valid with heavy tails.
        double kurtosis = Kurtosis(baseline.ResidualSample.Concat(window.ResidualSample).ToArray());
        double ratio = fit.ResidualStandardDeviation * fit.ResidualStandardDeviation / (baseline.ResidualStandardDeviation * baseline.ResidualStandardDeviation);
        double se = Math.Sqrt((kurtosis - 1.0) * ((1.0 / fit.ResidualDegreesOfFreedom) + (1.0 / baseline.ResidualDegreesOfFreedom)));
        double z = Math.Log(ratio) / se;
        double p = StandardDistributions.NormalTwoSided(z);
        double alpha = input.Alpha / 2.0;
        double sdRatio = Math.Sqrt(ratio);
        bool practical = ratio < input.Thresholds.SpreadRatioLow || ratio > input.Thresholds.SpreadRatioHigh;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "variance_ratio",
            Value = Finite(ratio),
            PValue = Finite(p),
            Threshold = alpha,
            Severity = Grade(p, alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(sdRatio),
            EffectSizeName = "residual_sd_ratio",
            Explanation = Fmt($"residual variance is {Num(ratio)}× the reference (SD {Num(fit.ResidualStandardDeviation)} against {Num(baseline.ResidualStandardDeviation)}; practical outside {Num(input.Thresholds.SpreadRatioLow)}–{Num(input.Thresholds.SpreadRatioHigh)}): z = {Num(z)}, {P(p)} (kurtosis-adjusted)"),
            Details = Details(("kurtosis", kurtosis), ("z", z)),
        };
    }

    private static double Kurtosis(double[] values)
    {
        double mean = values.Average();
        double m2 = values.Sum(v => (v - mean) * (v - mean)) / values.Length;
        double m4 = values.Sum(v => Math.Pow(v - mean, 4)) / values.Length;
        return m4 / (m2 * m2);
    }

    private static Finding Distribution(CheckInput input)
    {
        if (!HasSamples(input, out Finding? skip, "ks"))
        {
            return skip!;
        }

        KolmogorovSmirnovResult ks = KolmogorovSmirnov.TwoSampleSorted(input.Baseline.SortedResidualSample, SortedSample.Of(input.Window.ResidualSample));
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "ks",
            Value = ks.Statistic,
            PValue = ks.PValue,
            Threshold = input.Alpha,
            Severity = Grade(ks.PValue, input.Alpha, input.Thresholds.WarningAlpha, ks.Statistic >= input.Thresholds.KsFloor),
            EffectSize = ks.Statistic,
            EffectSizeName = "ks_distance",
            Explanation = Fmt($"standardized residual distribution against the reference: D = {Num(ks.Statistic)} (floor {Num(input.Thresholds.KsFloor)}), {P(ks.PValue)} ({(ks.Exact ? "exact" : "Kolmogorov limit")})"),
            Details = Details(("reference_n", ks.FirstCount), ("window_n", ks.SecondCount)),
        };
    }

    private static Finding Tails(CheckInput input)
    {
        if (!HasSamples(input, out Finding? skip, "anderson_darling"))
        {
            return skip!;
        }

        // Weights the tails more than KS. Its p-value is interpolated in a table that ends at 0.001, so it only warns.
        AndersonDarlingResult ad = AndersonDarlingKSample.ComputeSorted([input.Baseline.SortedResidualSample, SortedSample.Of(input.Window.ResidualSample)], midrank: true);
        double p = AndersonDarlingKSample.PValue(ad.Standardized, 2);
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "anderson_darling",
            Value = Finite(ad.Statistic),
            PValue = Finite(p),
            Threshold = input.Thresholds.WarningAlpha,
            Severity = p < input.Thresholds.WarningAlpha ? Severity.Warning : Severity.Ok,
            EffectSize = Finite(ad.Standardized),
            EffectSizeName = "standardized_statistic",
            Explanation = Fmt($"standardized residual tails against the reference: Anderson–Darling T = {Num(ad.Standardized)}, {P(p)} (interpolated; warns only)"),
        };
    }

    private static Finding ResidualVarianceAgainstFeatures(CheckInput input)
    {
        WindowSummary window = input.Window;
        int q = input.Baseline.Features.Count;
        if (window.RefitResidualSample.Length < Math.Max(20, q + 3) || q == 0)
        {
            return Skip(CheckNames.Residuals, "koenker_bp", SkipReasons.InsufficientData, "too few sampled rows with a refit for the heteroscedasticity test");
        }

        double[][] z = Enumerable.Range(0, window.SampleSize).Select(i => window.FeatureSamples.Select(f => f[i]).ToArray()).ToArray();
        StatisticalTest lm = Heteroscedasticity.Koenker(z, window.RefitResidualSample);
        double r2 = lm.Statistic / window.SampleSize;
        double? baseP = input.Baseline.HeteroscedasticityPValue;
        double baseR2 = input.Baseline.HeteroscedasticityStatistic is { } s && input.Baseline.SampleSize > 0 ? s / input.Baseline.SampleSize : double.NaN;

        // Alarm on appearance, or on a doubling of the explained share when the baseline already had some (methods.md §5.5).
        bool practical = baseP is null || baseP >= input.Thresholds.WarningAlpha || r2 >= 2.0 * baseR2;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "koenker_bp",
            Value = Finite(lm.Statistic),
            PValue = Finite(lm.PValue),
            Threshold = input.Alpha,
            Severity = Grade(lm.PValue, input.Alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(r2),
            EffectSizeName = "aux_r_squared",
            Explanation = Fmt($"residual variance against the features: Koenker LM = {Num(lm.Statistic)} on {q} df, {P(lm.PValue)} (baseline {P(baseP ?? double.NaN)})"),
            Details = Details(("baseline_aux_r_squared", baseR2)),
        };
    }

    private static Finding Serial(CheckInput input)
    {
        WindowSummary window = input.Window;
        long m = window.RowsAccepted;
        if (!input.Thresholds.TimeOrdered)
        {
            return Skip(CheckNames.Residuals, "ljung_box", SkipReasons.NotTimeOrdered, "rows are not time-ordered for this model, so serial correlation is not tested");
        }

        if (m < input.Thresholds.SerialCorrelationMinimumRows)
        {
            return Skip(CheckNames.Residuals, "durbin_watson", SkipReasons.InsufficientData, Fmt($"{m} rows; serial-correlation tests need {input.Thresholds.SerialCorrelationMinimumRows} time-ordered rows"));
        }

        if (m <= input.Thresholds.LjungBoxMinimumRows)
        {
            // The exact DW null depends on the design, so the p-value is bracketed by the Durbin–Watson bounds (Imhof);
            // the conservative end decides, and an approximate test can warn but not page.
            double d = window.DurbinWatson;
            int slopes = input.Baseline.ToLayout().ParameterCount - (input.Baseline.Intercept ? 1 : 0);
            bool positive = d <= 2.0;
            (double conservative, double liberal) = DurbinWatsonBounds.PositiveAutocorrelationPValue((int)m, slopes, positive ? d : 4.0 - d);
            double pdw = Math.Min(1.0, 2.0 * conservative);
            return new Finding
            {
                Check = CheckNames.Residuals,
                Statistic = "durbin_watson",
                Value = Finite(d),
                PValue = Finite(pdw),
                Threshold = input.Thresholds.WarningAlpha,
                Severity = pdw < input.Thresholds.WarningAlpha ? Severity.Warning : Severity.Ok,
                EffectSize = Finite(1.0 - (d / 2.0)),
                EffectSizeName = "lag1_autocorrelation",
                Explanation = Fmt($"deployed errors in row order: Durbin–Watson d = {Num(d)} (2 means none; {(positive ? "positive" : "negative")} side), two-sided p between {Num(Math.Min(1.0, 2.0 * liberal))} and {Num(pdw)} by the bounds"),
                Details = Details(("p_value_liberal", Math.Min(1.0, 2.0 * liberal))),
            };
        }

        int lags = (int)Math.Min(Math.Min(10, m / 5), window.Autocorrelations.Length);
        StatisticalTest lb = Autocorrelation.LjungBoxFromAutocorrelations(window.Autocorrelations.Take(lags).ToArray(), m);
        double r1 = window.Autocorrelations.Length > 0 ? window.Autocorrelations[0] : double.NaN;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "ljung_box",
            Value = Finite(lb.Statistic),
            PValue = Finite(lb.PValue),
            Threshold = input.Alpha,
            Severity = Grade(lb.PValue, input.Alpha, input.Thresholds.WarningAlpha, Math.Abs(r1) >= 0.1),
            EffectSize = Finite(r1),
            EffectSizeName = "lag1_autocorrelation",
            Explanation = Fmt($"serial correlation of the deployed errors: lag-1 r = {Num(r1)}, Ljung–Box Q({lags}) = {Num(lb.Statistic)}, {P(lb.PValue)}{(lb.PValue < input.Thresholds.WarningAlpha ? "; while it lasts, other tests' p-values are optimistic" : "")}"),
            Details = Details(("durbin_watson", window.DurbinWatson), ("lags", lags)),
        };
    }

    private static bool HasSamples(CheckInput input, out Finding? skip, string statistic)
    {
        skip = null;
        if (input.Baseline.ResidualSample.Count < 20)
        {
            skip = Skip(CheckNames.Residuals, statistic, SkipReasons.BaselineIncomplete, "the baseline stores no reference residual sample");
            return false;
        }

        if (input.Window.ResidualSample.Length < 20)
        {
            skip = Skip(CheckNames.Residuals, statistic, SkipReasons.InsufficientData, "fewer than 20 window rows for a distribution test");
            return false;
        }

        return true;
    }
}
