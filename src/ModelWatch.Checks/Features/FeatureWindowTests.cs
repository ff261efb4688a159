using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Features;

/// <summary>
/// The features check's per-run tests on the whole window: PSI over the baseline's decile bins as the effect size, its
/// significance from Pearson's homogeneity test against the reference sample's counts; KS with Holm (1979) across
/// features; and leverage exceedances against the beta-binomial null of the reference share.
/// </summary>
public static class FeatureWindowTests
{
    /// <summary>Floor on bin proportions before logarithms.</summary>
    public const double ProportionFloor = 1e-4;

    /// <summary>PSI = Σ (a − e) ln(a/e) over bins, proportions floored at <see cref="ProportionFloor"/>.</summary>
    public static double PopulationStabilityIndex(IReadOnlyList<double> reference, IReadOnlyList<long> counts)
    {
        ArgumentNullException.ThrowIfNull(reference);
        ArgumentNullException.ThrowIfNull(counts);
        double total = counts.Sum();
        double psi = 0.0;
        for (int b = 0; b < reference.Count; b++)
        {
            double e = Math.Max(reference[b], ProportionFloor);
            double a = Math.Max(counts[b] / total, ProportionFloor);
            psi += (a - e) * Math.Log(a / e);
        }

        return psi;
    }

    internal static IEnumerable<Finding> Run(CheckInput input)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        int q = baseline.Features.Count;
        double alpha = input.RunAlpha();
        var ks = new KolmogorovSmirnovResult?[q];
        var ksP = new double[q];
        for (int j = 0; j < q; j++)
        {
            bool canKs = j < baseline.FeatureSamples.Count && baseline.FeatureSamples[j].Length >= 20 && window.FeatureSamples[j].Length >= 20;
            ks[j] = canKs ? KolmogorovSmirnov.TwoSampleSorted(baseline.SortedFeatureSamples[j], SortedSample.Of(window.FeatureSamples[j])) : null;
            ksP[j] = ks[j]?.PValue ?? double.NaN;
        }

        double[] ksHolm = MultipleTesting.HolmAdjusted(ksP);
        double ksFloor = input.Setting(FeaturesCheck.KsFloor);
        for (int j = 0; j < q; j++)
        {
            string feature = baseline.Features[j];
            yield return Psi(input, j, feature, input.RunAlpha(tests: q));
            yield return ks[j] is { } r
                ? new Finding
                {
                    Check = CheckNames.Features,
                    Subject = feature,
                    Statistic = "ks",
                    Value = r.Statistic,
                    PValue = Finite(ksHolm[j]),
                    Alpha = alpha,
                    Limit = ksFloor,
                    Severity = Grade(ksHolm[j], alpha, input.Thresholds.WarningAlpha, r.Statistic >= ksFloor),
                    EffectSize = r.Statistic,
                    EffectSizeName = "ks_distance",
                    Explanation = Fmt($"distribution of {feature} against the reference: KS D = {Num(r.Statistic)} (floor {Num(ksFloor)}), {P(ksHolm[j])} after Holm over {q} features (window mean {Num(window.FeatureMeans[j])}, reference {Num(baseline.FeatureMeans.Count > j ? baseline.FeatureMeans[j] : double.NaN)})"),
                    Details = Details(("raw_p_value", r.PValue)),
                }
                : Skip(CheckNames.Features, "ks", SkipReasons.InsufficientData, "fewer than 20 rows in the reference or window sample of " + feature, feature);
        }

        yield return Leverage(input, alpha);
    }

    private static Finding Psi(CheckInput input, int j, string feature, double alpha)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        if (j >= baseline.FeatureBins.Count || j >= window.FeatureBinCounts.Count)
        {
            return Skip(CheckNames.Features, "psi", SkipReasons.BaselineIncomplete, "the baseline stores no bins for " + feature, feature);
        }

        long m = window.FeatureBinCounts[j].Sum();
        if (m < 50)
        {
            return Skip(CheckNames.Features, "psi", SkipReasons.InsufficientData, Fmt($"{m} rows; PSI needs at least 50"), feature);
        }

        double[] expected = baseline.FeatureBins[j].Proportions;
        double psi = PopulationStabilityIndex(expected, window.FeatureBinCounts[j]);

        // Significance from Pearson's homogeneity test of the window's bin counts against the reference sample's: PSI's
        // floored logarithms make its own chi-square approximation far too liberal in the tail when bins are thin.
        long[] referenceCounts = baseline.FeatureBins[j].Counts(baseline.SampleSize);
        (double chi2, int df, double p) = Homogeneity.Pearson(window.FeatureBinCounts[j], referenceCounts);
        double critical = input.Setting(FeaturesCheck.PsiCritical);
        Severity severity = psi >= critical && p < alpha ? Severity.Critical
            : (psi >= input.Setting(FeaturesCheck.PsiWarning) && p < input.Thresholds.WarningAlpha) || p < alpha ? Severity.Warning
            : Severity.Ok;
        return new Finding
        {
            Check = CheckNames.Features,
            Subject = feature,
            Statistic = "psi",
            Value = psi,
            PValue = Finite(p),
            Alpha = alpha,
            Limit = critical,
            Severity = severity,
            EffectSize = psi,
            EffectSizeName = "psi",
            Explanation = Fmt($"population stability of {feature}: PSI {Num(psi)} over the window's {m} rows (cut-off {Num(critical)}, common practice); bin shares against the reference: chi-square {Num(chi2)} on {df} df, {P(p)}"),
            Details = Details(("chi_square", chi2), ("df", df), ("psi_critical", critical), ("rows", m)),
        };
    }

    private static Finding Leverage(CheckInput input, double alpha)
    {
        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        if (!window.LeverageComputed || baseline.LeverageExceedanceShare is not { } share)
        {
            return Skip(CheckNames.Features, "leverage_exceedance", SkipReasons.BaselineIncomplete, "the baseline stores no reference factor or leverage quantiles, so extrapolation is not measured");
        }

        long m = window.RowsAccepted;
        long x = window.LeverageExceedanceCount;
        int n = baseline.SampleSize;
        int j = baseline.LeverageExceedanceCount;

        // New rows above the reference's (n − j)-th order statistic: BetaBinomial(m, j + 1, n − j) under no change.
        double p = BetaBinomial.UpperTailMidP(m, j + 1.0, n - j, x);
        double excess = ((double)x / m) - share;

        // The share is practical from the reference share plus the floor on.
        double limit = share + input.Setting(FeaturesCheck.LeverageExcessFloor);
        return new Finding
        {
            Check = CheckNames.Features,
            Statistic = "leverage_exceedance",
            Value = (double)x / m,
            PValue = Finite(p),
            Alpha = alpha,
            Limit = Finite(limit),
            Severity = Grade(p, alpha, input.Thresholds.WarningAlpha, excess >= input.Setting(FeaturesCheck.LeverageExcessFloor)),
            EffectSize = excess,
            EffectSizeName = "exceedance_share_excess",
            Explanation = Fmt($"{Pct((double)x / m)} of rows lie beyond the reference's 99th-percentile leverage (reference {Pct(share)}, practical from {Share(limit)}; {window.LeverageAboveReferenceMaximumCount} beyond any reference row, max leverage {Num(window.MaximumLeverage)}): predictions there are extrapolations, {P(p)}"),
            Details = Details(("exceedances", x), ("above_reference_maximum", window.LeverageAboveReferenceMaximumCount), ("maximum_leverage", window.MaximumLeverage)),
        };
    }
}
