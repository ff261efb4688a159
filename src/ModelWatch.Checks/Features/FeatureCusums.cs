using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Sequential;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Features;

/// <summary>
/// The features check's CUSUMs on the rows new since the previous run, each compared with every row consumed before
/// (the reference rows and all earlier increments), which makes successive inputs independent under no change:
/// <list type="bullet">
/// <item>location, per feature: <c>z = (x̄_new − x̄_before)/(s_ref·√(1/m + 1/N))</c>, the block form of Helmert's
/// contrasts, into a two-sided Page (1954) CUSUM;</item>
/// <item>shape, per feature: Pearson's chi-square of the new rows' bin counts against the counts before (a 2×B
/// homogeneity table; successive such tables partition the total chi-square and are asymptotically independent,
/// Lancaster 1949, from memory), as a normal score into a one-sided CUSUM;</item>
/// <item>extrapolation: the new rows above the reference's leverage threshold against the share before
/// (beta-binomial mid-p), as a normal score into a one-sided CUSUM.</item>
/// </list>
/// Blocks too small for a chi-square or an exceedance count wait (pending) and join the next run's rows. From an alarm
/// until the sums are back at zero, rows stay out of the running means and counts, so a shift's rows are kept out and
/// its end is not mistaken for a new shift. A crossing pages when the new rows' shift is also practical (location floor, PSI
/// cut-off, leverage excess).
/// </summary>
internal static class FeatureCusums
{
    /// <summary>Smallest block for the location CUSUM (a mean of fewer rows is too far from normal).</summary>
    private const int LocationRows = 10;

    public static (IReadOnlyList<Finding> Findings, FeaturesState State) Step(CheckInput input, FeaturesState state)
    {
        const string check = CheckNames.Features;
        BaselineReference baseline = input.Baseline;
        int q = baseline.Features.Count;
        if (Increment.Unmarked(input, check, "location_cusum") is { } unmarked)
        {
            return ([unmarked], state);
        }

        state = Initialised(baseline, state);
        var findings = new List<Finding>();
        AugmentedFactor? fresh = Increment.Of(input);
        if (fresh is null)
        {
            return (findings, state);
        }

        double k = input.Thresholds.CusumReference;
        if (state.Means.Length == q && baseline.FeatureStandardDeviations.Count == q)
        {
            state = Location(input, state, fresh, k, findings);
        }

        if (state.BinCounts.Length == q && input.Window.NewRowsFeatureBinCounts.Count == q)
        {
            state = Shape(input, state, k, findings);
        }

        if (input.Window.LeverageComputed && baseline.LeverageExceedanceShare is not null)
        {
            state = Leverage(input, state, fresh.RowCount, k, findings);
        }

        return (findings, state);
    }

    private static FeaturesState Initialised(BaselineReference baseline, FeaturesState state)
    {
        if (state.MeanRows > 0 || state.BinCounts.Length > 0 || state.LeverageRows > 0)
        {
            return state;
        }

        int q = baseline.Features.Count;
        long meanRows = baseline.FactorRowCount > 0 ? baseline.FactorRowCount : baseline.SampleSize;
        return state with
        {
            MeanRows = baseline.FeatureMeans.Count == q ? meanRows : 0,
            Means = baseline.FeatureMeans.Count == q ? [.. baseline.FeatureMeans] : [],
            BinCounts = baseline.FeatureBins.Count == q ? [.. baseline.FeatureBins.Select(b => b.Counts(baseline.SampleSize))] : [],
            PendingBinCounts = baseline.FeatureBins.Count == q ? [.. baseline.FeatureBins.Select(b => new long[b.Proportions.Length])] : [],
            LeverageExceedances = baseline.LeverageExceedanceCount,
            LeverageRows = baseline.LeverageExceedanceShare is null ? 0 : baseline.SampleSize,
        };
    }

    private static FeaturesState Location(CheckInput input, FeaturesState state, AugmentedFactor fresh, double k, List<Finding> findings)
    {
        BaselineReference baseline = input.Baseline;
        int q = baseline.Features.Count;
        double m = fresh.RowCount;
        if (m < LocationRows)
        {
            // Too few rows for a normal mean; they still join the running means, which only widens the next comparison.
            return state with { Means = [.. Enumerable.Range(0, q).Select(j => ((state.Means[j] * state.MeanRows) + (fresh.Columns[j].Mean * m)) / (state.MeanRows + m))], MeanRows = state.MeanRows + (long)m };
        }

        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds, cusums: q);
        double floor = input.Setting(FeaturesCheck.LocationFloor);
        var sums = new Dictionary<string, CusumSums>(state.Location, StringComparer.Ordinal);
        var means = new double[q];
        for (int j = 0; j < q; j++)
        {
            string feature = baseline.Features[j];
            double sd = baseline.FeatureStandardDeviations[j];
            double now = fresh.Columns[j].Mean;
            double before = state.Means[j];
            means[j] = ((before * state.MeanRows) + (now * m)) / (state.MeanRows + m);
            if (!(sd > 0))
            {
                continue;
            }

            double z = (now - before) / (sd * Math.Sqrt((1.0 / m) + (1.0 / state.MeanRows)));
            (CusumSums next, bool alarm, CusumSums crossed) = sums.GetValueOrDefault(feature, new CusumSums()).Step(z, k, h);
            sums[feature] = next;
            double shift = baseline.FeatureMeans.Count > j ? (now - baseline.FeatureMeans[j]) / sd : double.NaN;
            bool practical = Math.Abs(shift) >= floor;
            findings.Add(new Finding
            {
                Check = CheckNames.Features,
                Subject = feature,
                Statistic = "location_cusum",
                Value = crossed.Peak,
                Limit = h,
                Severity = GradeCusum(alarm, practical, crossed.Peak, h),
                EffectSize = Finite(shift),
                EffectSizeName = "mean_shift_in_reference_sd",
                RequiresPersistence = false,
                Explanation = alarm
                    ? Fmt($"{feature} has moved: the mean of its {m} new rows is {Num(now)} against {Num(baseline.FeatureMeans.Count > j ? baseline.FeatureMeans[j] : double.NaN)} at baseline ({Num(shift)} SD; floor {Num(floor)}); location CUSUM {Num(crossed.Peak)} crossed h = {Num(h)}")
                    : Fmt($"CUSUM of {feature}'s mean at {Num(crossed.Peak)} of h = {Num(h)}; the {m} new rows average {Num(now)} ({Num(shift)} SD from baseline, z = {Num(z)})"),
                Details = Details(("z", z), ("upper", crossed.Upper), ("lower", crossed.Lower), ("new_rows", m), ("new_mean", now)),
            });
        }

        bool alarmed = Quarantine.Alarmed(state.Location, sums);
        bool quarantined = Quarantine.After(state.LocationQuarantined, alarmed, sums.Values);
        return state.LocationQuarantined || alarmed
            ? state with { Location = sums, LocationQuarantined = quarantined }
            : state with { Means = means, MeanRows = state.MeanRows + (long)m, Location = sums, LocationQuarantined = quarantined };
    }

    private static FeaturesState Shape(CheckInput input, FeaturesState state, double k, List<Finding> findings)
    {
        BaselineReference baseline = input.Baseline;
        int q = baseline.Features.Count;
        long[][] pending = [.. state.PendingBinCounts.Select((p, j) => p.Zip(input.Window.NewRowsFeatureBinCounts[j], (a, b) => a + b).ToArray())];
        long rows = pending.Length > 0 ? pending[0].Sum() : 0;
        int bins = pending.Length > 0 ? pending.Max(p => p.Length) : 0;

        // Pearson's chi-square wants about five rows a bin; smaller blocks wait for the next run's rows.
        if (rows < 5L * bins)
        {
            return state with { PendingBinCounts = pending };
        }

        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds, cusums: q, oneSided: true);
        double critical = input.Setting(FeaturesCheck.PsiCritical);
        var sums = new Dictionary<string, CusumSums>(state.Shape, StringComparer.Ordinal);
        for (int j = 0; j < q; j++)
        {
            string feature = baseline.Features[j];
            (double chi2, int df, double p) = Homogeneity.Pearson(pending[j], state.BinCounts[j]);
            double z = StandardDistributions.UpperTailToNormalScore(p);
            (CusumSums next, bool alarm, CusumSums crossed) = sums.GetValueOrDefault(feature, new CusumSums()).StepUpper(z, k, h);
            sums[feature] = next;

            // The block's PSI less what noise alone gives it on average, (B − 1)(1/M + 1/N), against the cut-off.
            double psi = FeatureWindowTests.PopulationStabilityIndex(baseline.FeatureBins[j].Proportions, pending[j]);
            double excess = psi - ((pending[j].Length - 1) * ((1.0 / rows) + (1.0 / baseline.SampleSize)));
            findings.Add(new Finding
            {
                Check = CheckNames.Features,
                Subject = feature,
                Statistic = "shape_cusum",
                Value = crossed.Upper,
                Limit = h,
                Severity = GradeCusum(alarm, excess >= critical, crossed.Upper, h),
                EffectSize = Finite(psi),
                EffectSizeName = "psi",
                RequiresPersistence = false,
                Explanation = alarm
                    ? Fmt($"{feature}'s distribution has changed shape: its {rows} new rows fill the baseline's bins unlike all rows before (chi-square {Num(chi2)} on {df} df); bin-share CUSUM {Num(crossed.Upper)} crossed h = {Num(h)}; PSI of the new rows {Num(psi)} (cut-off {Num(critical)})")
                    : Fmt($"CUSUM of {feature}'s bin shares at {Num(crossed.Upper)} of h = {Num(h)}; {rows} new rows, chi-square {Num(chi2)} on {df} df, PSI {Num(psi)}"),
                Details = Details(("chi_square", chi2), ("df", df), ("z", z), ("new_rows", rows)),
            });
        }

        bool alarmed = Quarantine.Alarmed(state.Shape, sums);
        long[][] counts = state.ShapeQuarantined || alarmed ? state.BinCounts : [.. state.BinCounts.Select((c, j) => c.Zip(pending[j], (a, b) => a + b).ToArray())];
        return state with { BinCounts = counts, PendingBinCounts = [.. pending.Select(p => new long[p.Length])], Shape = sums, ShapeQuarantined = Quarantine.After(state.ShapeQuarantined, alarmed, sums.Values) };
    }

    private static FeaturesState Leverage(CheckInput input, FeaturesState state, long newRows, double k, List<Finding> findings)
    {
        long rows = state.PendingLeverageRows + newRows;
        long exceed = state.PendingLeverageExceedances + input.Window.NewRowsLeverageExceedanceCount;
        double before = (double)state.LeverageExceedances / state.LeverageRows;

        // An exceedance count needs about five expected exceedances to be more than a coin toss; smaller blocks wait.
        if (rows * before < 5.0)
        {
            return state with { PendingLeverageRows = rows, PendingLeverageExceedances = exceed };
        }

        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds, oneSided: true);
        double p = BetaBinomial.UpperTailMidP(rows, state.LeverageExceedances + 1.0, state.LeverageRows - state.LeverageExceedances, exceed);
        double z = StandardDistributions.UpperTailToNormalScore(p);
        (CusumSums next, bool alarm, CusumSums crossed) = state.Leverage.StepUpper(z, k, h);
        double share = (double)exceed / rows;
        double reference = input.Baseline.LeverageExceedanceShare ?? before;
        double excess = share - reference;
        findings.Add(new Finding
        {
            Check = CheckNames.Features,
            Statistic = "leverage_cusum",
            Value = crossed.Upper,
            Limit = h,
            Severity = GradeCusum(alarm, excess >= input.Setting(FeaturesCheck.LeverageExcessFloor), crossed.Upper, h),
            EffectSize = Finite(excess),
            EffectSizeName = "exceedance_share_excess",
            RequiresPersistence = false,
            Explanation = alarm
                ? Fmt($"more new rows lie outside the fitted design: {exceed} of {rows} ({Pct(share)}) beyond the reference's 99th-percentile leverage against {Pct(reference)} at baseline; leverage CUSUM {Num(crossed.Upper)} crossed h = {Num(h)}")
                : Fmt($"CUSUM of leverage exceedances at {Num(crossed.Upper)} of h = {Num(h)}; {exceed} of {rows} new rows ({Pct(share)}) beyond the reference's 99th percentile"),
            Details = Details(("z", z), ("exceedances", exceed), ("new_rows", rows)),
        });
        bool keepOut = state.LeverageQuarantined || alarm;
        return state with
        {
            LeverageExceedances = state.LeverageExceedances + (keepOut ? 0 : exceed),
            LeverageRows = state.LeverageRows + (keepOut ? 0 : rows),
            LeverageQuarantined = Quarantine.After(state.LeverageQuarantined, alarm, [next]),
            PendingLeverageRows = 0,
            PendingLeverageExceedances = 0,
            Leverage = next,
        };
    }
}
