using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>features</c> (methods.md §7): per feature, the population stability index against the baseline's quantile
/// bins (every window row) with the sample-size-aware null <c>PSI ≈ (1/N + 1/M)·χ²_{B−1}</c>, and a two-sample KS
/// against the reference sample (reservoir rows) with Holm across features; for the model, the share of rows whose
/// leverage exceeds the reference's 99th percentile, against the beta-binomial null of the reference share.
/// </summary>
public static class FeaturesCheck
{
    /// <summary>Floor on bin proportions before logarithms (methods.md §7.1).</summary>
    public const double ProportionFloor = 1e-4;

    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Features;
        CheckState state = input.CurrentState;
        if (!input.FixedSampleDue)
        {
            return NotDue(check, state, "psi", "feature tests run");
        }

        BaselineReference baseline = input.Baseline;
        WindowSummary window = input.Window;
        var findings = new List<Finding>();
        double alpha = input.Alpha;
        int q = baseline.Features.Count;
        var ksP = new double[q];
        var ks = new KolmogorovSmirnovResult?[q];
        for (int j = 0; j < q; j++)
        {
            bool canKs = j < baseline.FeatureSamples.Count && baseline.FeatureSamples[j].Length >= 20 && window.FeatureSamples[j].Length >= 20;
            ks[j] = canKs ? KolmogorovSmirnov.TwoSampleSorted(baseline.SortedFeatureSamples[j], SortedSample.Of(window.FeatureSamples[j])) : null;
            ksP[j] = ks[j]?.PValue ?? double.NaN;
        }

        double[] ksHolm = MultipleTesting.HolmAdjusted(ksP);
        for (int j = 0; j < q; j++)
        {
            string feature = baseline.Features[j];
            findings.Add(Psi(input, j, feature, alpha));
            findings.Add(ks[j] is { } r
                ? new Finding
                {
                    Check = check,
                    Subject = feature,
                    Statistic = "ks",
                    Value = r.Statistic,
                    PValue = Finite(ksHolm[j]),
                    Threshold = alpha,
                    Severity = Grade(ksHolm[j], alpha, input.Thresholds.WarningAlpha, r.Statistic >= input.Thresholds.KsFloor),
                    EffectSize = r.Statistic,
                    EffectSizeName = "ks_distance",
                    Explanation = Fmt($"distribution of {feature} against the reference: KS D = {Num(r.Statistic)}, {P(ksHolm[j])} after Holm over {q} features (window mean {Num(window.FeatureMeans[j])}, reference {Num(baseline.FeatureMeans.Count > j ? baseline.FeatureMeans[j] : double.NaN)})"),
                    Details = Details(("raw_p_value", r.PValue)),
                }
                : Skip(check, "ks", SkipReasons.InsufficientData, "fewer than 20 rows in the reference or window sample of " + feature, feature));
        }

        findings.Add(Leverage(input, alpha));
        return new CheckResult { Check = check, State = state with { LastTestedWindowEnd = input.WindowEnd }, Findings = findings };
    }

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
        int df = expected.Length - 1;
        double scale = (1.0 / baseline.SampleSize) + (1.0 / m);
        double p = StandardDistributions.ChiSquareUpperTail(psi / scale, df);
        double nullQuantile = scale * StandardDistributions.ChiSquareUpperQuantile(Math.Min(alpha, 0.5), df);
        Severity severity = psi >= input.Thresholds.PsiCritical && p < alpha ? Severity.Critical
            : (psi >= input.Thresholds.PsiWarning && p < input.Thresholds.WarningAlpha) || p < alpha ? Severity.Warning
            : Severity.Ok;
        return new Finding
        {
            Check = CheckNames.Features,
            Subject = feature,
            Statistic = "psi",
            Value = psi,
            PValue = Finite(p),
            Threshold = Finite(Math.Max(nullQuantile, input.Thresholds.PsiCritical)),
            Severity = severity,
            EffectSize = psi,
            EffectSizeName = "psi",
            Explanation = Fmt($"population stability of {feature}: PSI {Num(psi)} (0.10/0.25 cut-offs are common practice; noise alone reaches {Num(nullQuantile)} at the budgeted level for these sizes), {P(p)}"),
            Details = Details(("null_quantile", nullQuantile), ("rows", m)),
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
        return new Finding
        {
            Check = CheckNames.Features,
            Statistic = "leverage_exceedance",
            Value = (double)x / m,
            PValue = Finite(p),
            Threshold = alpha,
            Severity = Grade(p, alpha, input.Thresholds.WarningAlpha, excess >= input.Thresholds.LeverageExcessFloor),
            EffectSize = excess,
            EffectSizeName = "exceedance_share_excess",
            Explanation = Fmt($"{Pct((double)x / m)} of rows lie beyond the reference's 99th-percentile leverage (reference {Pct(share)}; {window.LeverageAboveReferenceMaximumCount} beyond any reference row, max leverage {Num(window.MaximumLeverage)}): predictions there are extrapolations, {P(p)}"),
            Details = Details(("exceedances", x), ("above_reference_maximum", window.LeverageAboveReferenceMaximumCount), ("maximum_leverage", window.MaximumLeverage)),
        };
    }
}
