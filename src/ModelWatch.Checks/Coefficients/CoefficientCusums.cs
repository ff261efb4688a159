using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Sequential;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// A Page (1954) CUSUM per slope on the rows new since the previous run: the block's own estimate against the fit of
/// every row consumed before (reference rows included), <c>d = b̂_block − b̂_before</c>, standardized by
/// <c>s_ref·√([(X_beforeᵀX_before)⁻¹]_jj + [(X_blockᵀX_block)⁻¹]_jj)</c>. These innovations are the block form of
/// recursive estimates: with no change each d is independent of every earlier one (its covariance with the previous
/// block's is zero, since the running fit absorbs each block by its precision), so every run adds an independent piece
/// of evidence and the CUSUM's tabulated ARL applies. A block with too few rows for its own estimate waits for the
/// next run's rows; from an alarm until every sum is back at zero, blocks stay out of the running fit (a shift's rows
/// are kept out). A crossing pages at once when the coefficient's own move, on the newest rows against the deployed
/// value, also matters for predictions (<see cref="PredictiveImpact.PerCoefficient"/>).
/// </summary>
internal static class CoefficientCusums
{
    public static (IReadOnlyList<Finding> Findings, CoefficientsState State) Step(CheckInput input, CoefficientsState state, PredictiveImpact? recent)
    {
        const string check = CheckNames.Coefficients;
        BaselineReference baseline = input.Baseline;
        DesignLayout layout = baseline.ToLayout();
        int p = layout.ParameterCount;
        var slopes = Enumerable.Range(0, p).Where(j => !(layout.Intercept && j == 0)).ToList();
        AugmentedFactor? running = state.Running?.ToFactor(layout) ?? baseline.ToFactor();
        if (running is null || slopes.Count == 0)
        {
            return (slopes.Count == 0 ? [] : [Skip(check, "cusum", SkipReasons.BaselineIncomplete, "the baseline stores no reference factor, so the coefficient CUSUMs cannot run")], state);
        }

        if (Increment.Of(input) is not { } fresh)
        {
            return ([], state);
        }

        AugmentedFactor block = state.Pending is { } pending ? RegressionMath.Merge(pending.ToFactor(layout), fresh) : fresh;
        FitSummary? blockFit = block.RowCount > p + 1 ? LeastSquaresFit.Fit(block) : null;
        FitSummary before = LeastSquaresFit.Fit(running);
        if (blockFit is not { IsFullRank: true } || !before.IsFullRank)
        {
            // Too few (or too alike) new rows to estimate every coefficient: they wait for the next run's.
            return ([], state with { Pending = StoredFactor.Of(block) });
        }

        double s = baseline.ResidualStandardDeviation;
        double h = FalseAlarmBudget.CusumThreshold(input.Thresholds, cusums: slopes.Count);
        double k = input.Thresholds.CusumReference;
        double[] beforeVariance = UpperTriangular.InverseGramDiagonal(RegressionMath.R(running));
        double[] blockVariance = UpperTriangular.InverseGramDiagonal(RegressionMath.R(block));
        double[] bBefore = RegressionMath.Estimates(before);
        double[] bBlock = RegressionMath.Estimates(blockFit);
        double floor = input.Setting(CoefficientsCheck.DriftImpactFloor);
        var sums = new Dictionary<string, CusumSums>(state.Cusums, StringComparer.Ordinal);
        var findings = new List<Finding>();
        foreach (int j in slopes)
        {
            string term = layout.Terms[j];
            double d = bBlock[j] - bBefore[j];
            double t = d / (s * Math.Sqrt(beforeVariance[j] + blockVariance[j]));
            double z = StandardDistributions.StudentTToNormalScore(t, baseline.ResidualDegreesOfFreedom);
            (CusumSums next, bool alarm, CusumSums crossed) = sums.GetValueOrDefault(term, new CusumSums()).Step(z, k, h);
            sums[term] = next;
            string direction = crossed.Upper >= crossed.Lower ? "up" : "down";

            // Pages only when this coefficient's own move, on the newest rows against the deployed value, matters.
            bool practical = recent is { } r && r.PerCoefficient[j] >= floor;
            findings.Add(new Finding
            {
                Check = check,
                Subject = term,
                Statistic = "cusum",
                Value = crossed.Peak,
                Limit = h,
                Severity = GradeCusum(alarm, practical, crossed.Peak, h),
                EffectSize = Finite(d),
                EffectSizeName = "coefficient_change",
                RequiresPersistence = false,
                Explanation = alarm
                    ? Fmt($"the coefficient of {term} has moved {direction}: the {block.RowCount} new rows give {Num(bBlock[j])} against {Num(bBefore[j])} from all rows before; CUSUM {Num(crossed.Peak)} crossed h = {Num(h)}; {CoefficientsCheck.Impact(recent, j, floor)}")
                    : Fmt($"CUSUM of {term}'s coefficient at {Num(crossed.Peak)} of h = {Num(h)}; the {block.RowCount} new rows give {Num(bBlock[j])} against {Num(bBefore[j])} (z = {Num(z)})"),
                Details = Details(("z", z), ("upper", crossed.Upper), ("lower", crossed.Lower), ("new_rows", block.RowCount), ("block_estimate", bBlock[j]), ("running_estimate", bBefore[j])),
            });
        }

        bool alarmed = Quarantine.Alarmed(state.Cusums, sums);
        AugmentedFactor kept = state.Quarantined || alarmed ? running : RegressionMath.Merge(running, block);
        return (findings, state with { Running = StoredFactor.Of(kept), Pending = null, Cusums = sums, Quarantined = Quarantine.After(state.Quarantined, alarmed, sums.Values) });
    }
}
