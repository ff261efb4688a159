using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Residuals;

/// <summary>The residuals check's per-run tests of the errors' shape on the window: distribution, tails, heteroscedasticity, serial correlation.</summary>
internal static class ResidualShape
{
    /// <summary>
    /// Two-sample Kolmogorov–Smirnov of the standardized deployed errors against the reference sample: exact (Hodges
    /// 1958) when n·m ≤ 250,000, else the Kolmogorov limit.
    /// </summary>
    public static Finding Distribution(CheckInput input)
    {
        if (!HasSamples(input, out Finding? skip, "ks"))
        {
            return skip!;
        }

        KolmogorovSmirnovResult ks = KolmogorovSmirnov.TwoSampleSorted(input.Baseline.SortedResidualSample, SortedSample.Of(input.Window.ResidualSample));
        double alpha = input.RunAlpha();
        double floor = input.Setting(ResidualsCheck.KsFloor);
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "ks",
            Value = ks.Statistic,
            PValue = ks.PValue,
            Alpha = alpha,
            Limit = floor,
            Severity = Grade(ks.PValue, alpha, input.Thresholds.WarningAlpha, ks.Statistic >= floor),
            EffectSize = ks.Statistic,
            EffectSizeName = "ks_distance",
            Explanation = Fmt($"standardized residual distribution against the reference: D = {Num(ks.Statistic)} (floor {Num(floor)}), {P(ks.PValue)} ({(ks.Exact ? "exact" : "Kolmogorov limit")})"),
            Details = Details(("reference_n", ks.FirstCount), ("window_n", ks.SecondCount)),
        };
    }

    /// <summary>
    /// The two-sample Anderson–Darling statistic (Scholz &amp; Stephens 1987, midrank): weights the tails more than KS; its
    /// p-value is interpolated in a table that ends at 0.001, so it warns but never pages. The finding's value is the
    /// standardized T the p-value is read from (the text prints it); the raw A² is in the details.
    /// </summary>
    public static Finding Tails(CheckInput input)
    {
        if (!HasSamples(input, out Finding? skip, "anderson_darling"))
        {
            return skip!;
        }

        AndersonDarlingResult ad = AndersonDarlingKSample.ComputeSorted([input.Baseline.SortedResidualSample, SortedSample.Of(input.Window.ResidualSample)], midrank: true);
        double p = AndersonDarlingKSample.PValue(ad.Standardized, 2);
        string source = AndersonDarlingKSample.BeyondTable(ad.Standardized, 2) ? "at most: beyond the table" : "interpolated";
        double level = input.Thresholds.WarningAlpha;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "anderson_darling",
            Value = Finite(ad.Standardized),
            PValue = Finite(p),
            Alpha = level,
            Severity = p < level ? Severity.Warning : Severity.Ok,
            EffectSize = Finite(ad.Standardized),
            EffectSizeName = "standardized_statistic",
            Explanation = Fmt($"standardized residual tails against the reference: Anderson–Darling T = {Num(ad.Standardized)}, {P(p)} ({source}; warns only, at α {Level(level)})"),
            Details = Details(("a2", ad.Statistic), ("a2_standard_deviation", ad.StandardDeviation)),
        };
    }

    /// <summary>
    /// Koenker's (1981) studentized Breusch–Pagan on the refit's residuals (reservoir rows); practical when the
    /// baseline showed none or the auxiliary R² at least doubled.
    /// </summary>
    public static Finding Heteroscedasticity(CheckInput input)
    {
        WindowSummary window = input.Window;
        int q = input.Baseline.Features.Count;
        if (window.RefitResidualSample.Length < Math.Max(20, q + 3) || q == 0)
        {
            return Skip(CheckNames.Residuals, "koenker_bp", SkipReasons.InsufficientData, "too few sampled rows with a refit for the heteroscedasticity test");
        }

        double[][] z = Enumerable.Range(0, window.SampleSize).Select(i => window.FeatureSamples.Select(f => f[i]).ToArray()).ToArray();
        StatisticalTest lm = Numerics.Statistics.Heteroscedasticity.Koenker(z, window.RefitResidualSample);
        double r2 = lm.Statistic / window.SampleSize;
        double? baseP = input.Baseline.HeteroscedasticityPValue;
        double baseR2 = input.Baseline.HeteroscedasticityStatistic is { } s && input.Baseline.SampleSize > 0 ? s / input.Baseline.SampleSize : double.NaN;
        bool practical = baseP is null || baseP >= input.Thresholds.WarningAlpha || r2 >= 2.0 * baseR2;
        double alpha = input.RunAlpha();
        double critical = StandardDistributions.ChiSquareUpperQuantile(alpha, q);
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "koenker_bp",
            Value = Finite(lm.Statistic),
            PValue = Finite(lm.PValue),
            Alpha = alpha,
            Limit = Finite(critical),
            Severity = Grade(lm.PValue, alpha, input.Thresholds.WarningAlpha, practical),
            EffectSize = Finite(r2),
            EffectSizeName = "aux_r_squared",
            Explanation = Fmt($"residual variance against the features: Koenker LM = {Num(lm.Statistic)} on {q} df (critical {Num(critical)} at α {Level(alpha)}), {P(lm.PValue)} (baseline {P(baseP ?? double.NaN)})"),
            Details = Details(("baseline_aux_r_squared", baseR2)),
        };
    }

    /// <summary>
    /// Serial correlation of the deployed errors in row order: Ljung &amp; Box (1978) on min(10, m/5) lags beyond the
    /// Ljung–Box minimum (floor |r₁| ≥ 0.1); Durbin–Watson (1950, 1951) below it, bracketed by the bounds (warns only).
    /// </summary>
    public static Finding Serial(CheckInput input)
    {
        WindowSummary window = input.Window;
        long m = window.RowsAccepted;
        if (input.Setting(ResidualsCheck.TimeOrdered) == 0.0)
        {
            return Skip(CheckNames.Residuals, "ljung_box", SkipReasons.NotTimeOrdered, "rows are not time-ordered for this model, so serial correlation is not tested");
        }

        int minimum = (int)input.Setting(ResidualsCheck.SerialCorrelationMinimumRows);
        if (m < minimum)
        {
            return Skip(CheckNames.Residuals, "durbin_watson", SkipReasons.InsufficientData, Fmt($"{m} rows; serial-correlation tests need {minimum} time-ordered rows"));
        }

        if (m <= (int)input.Setting(ResidualsCheck.LjungBoxMinimumRows))
        {
            // The exact DW null depends on the design, so the p-value is bracketed by the Durbin–Watson bounds (Imhof);
            // the conservative end decides, and an approximate test can warn but not page.
            double d = window.DurbinWatson;
            int slopes = input.Baseline.ToLayout().ParameterCount - (input.Baseline.Intercept ? 1 : 0);
            bool positive = d <= 2.0;
            (double conservative, double liberal) = DurbinWatsonBounds.PositiveAutocorrelationPValue((int)m, slopes, positive ? d : 4.0 - d);
            double pdw = Math.Min(1.0, 2.0 * conservative);
            double level = input.Thresholds.WarningAlpha;
            return new Finding
            {
                Check = CheckNames.Residuals,
                Statistic = "durbin_watson",
                Value = Finite(d),
                PValue = Finite(pdw),
                Alpha = level,
                Severity = pdw < level ? Severity.Warning : Severity.Ok,
                EffectSize = Finite(1.0 - (d / 2.0)),
                EffectSizeName = "lag1_autocorrelation",
                Explanation = Fmt($"deployed errors in row order: Durbin–Watson d = {Num(d)} (2 means none; {(positive ? "positive" : "negative")} side), two-sided p between {Num(Math.Min(1.0, 2.0 * liberal))} and {Num(pdw)} by the bounds; the conservative end, {P(pdw)}, decides (warns only, at α {Level(level)})"),
                Details = Details(("p_value_liberal", Math.Min(1.0, 2.0 * liberal))),
            };
        }

        int lags = (int)Math.Min(Math.Min(10, m / 5), window.Autocorrelations.Length);
        StatisticalTest lb = Autocorrelation.LjungBoxFromAutocorrelations(window.Autocorrelations.Take(lags).ToArray(), m);
        double r1 = window.Autocorrelations.Length > 0 ? window.Autocorrelations[0] : double.NaN;
        double alpha = input.RunAlpha();
        double critical = lags > 0 ? StandardDistributions.ChiSquareUpperQuantile(alpha, lags) : double.NaN;
        return new Finding
        {
            Check = CheckNames.Residuals,
            Statistic = "ljung_box",
            Value = Finite(lb.Statistic),
            PValue = Finite(lb.PValue),
            Alpha = alpha,
            Limit = Finite(critical),
            Severity = Grade(lb.PValue, alpha, input.Thresholds.WarningAlpha, Math.Abs(r1) >= 0.1),
            EffectSize = Finite(r1),
            EffectSizeName = "lag1_autocorrelation",
            Explanation = Fmt($"serial correlation of the deployed errors: lag-1 r = {Num(r1)}, Ljung–Box Q({lags}) = {Num(lb.Statistic)} (critical {Num(critical)} at α {Level(alpha)}), {P(lb.PValue)}{(lb.PValue < input.Thresholds.WarningAlpha ? "; while it lasts, other tests' p-values are optimistic" : "")}"),
            Details = Details(("durbin_watson", window.DurbinWatson), ("lags", lags)),
        };
    }

    public static bool HasSamples(CheckInput input, out Finding? skip, string statistic)
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
