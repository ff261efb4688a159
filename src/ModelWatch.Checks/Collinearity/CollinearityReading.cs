using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Collinearity;

/// <summary>One set of rows' collinearity against the baseline: a VIF finding per feature and a condition-number finding.</summary>
internal static class CollinearityReading
{
    public static IEnumerable<Finding> Read(CheckInput input, FitSummary fit, bool newRows, double alpha)
    {
        BaselineReference baseline = input.Baseline;
        CollinearityNull? spread = CollinearityNull.For(baseline, fit.RowCount);
        string suffix = newRows ? "_new_rows" : string.Empty;
        string rows = newRows ? Fmt($"the {fit.RowCount} new rows") : Fmt($"the window's {fit.RowCount} rows");
        double vifAlarm = input.Setting(CollinearityCheck.VifAlarm);
        double vifRatio = input.Setting(CollinearityCheck.VifRatio);
        for (int j = 0; j < baseline.Features.Count; j++)
        {
            string feature = baseline.Features[j];
            if (!fit.VarianceInflationFactors.TryGetValue(feature, out double vif))
            {
                continue;
            }

            double reference = baseline.VarianceInflationFactors.TryGetValue(feature, out double r) ? r : double.NaN;
            double ratio = vif / reference;
            double p = spread is null ? double.NaN : CollinearityNull.UpperTail(vif, spread.MeanLogVif[j], spread.SdLogVif[j]);
            bool beyondChance = double.IsNaN(p) || p < alpha;
            bool floors = vif >= vifAlarm && ratio >= vifRatio;
            bool partly = vif >= vifAlarm || (ratio >= vifRatio && vif >= vifAlarm / 2.0);
            yield return new Finding
            {
                Check = CheckNames.Collinearity,
                Subject = feature,
                Statistic = "vif" + suffix,
                Value = Finite(vif),
                PValue = Finite(p),
                Alpha = double.IsNaN(p) ? null : alpha,
                Limit = vifAlarm,
                Severity = floors && beyondChance ? Severity.Critical : partly && (double.IsNaN(p) || p < input.Thresholds.WarningAlpha) ? Severity.Warning : Severity.Ok,
                EffectSize = Finite(ratio),
                EffectSizeName = "vif_ratio",
                Explanation = Fmt($"VIF of {feature} in {rows} is {Num(vif)} against {Num(reference)} at baseline (×{Num(ratio)}; pages at {Num(vifAlarm)} and ×{Num(vifRatio)}): its coefficient's variance is inflated that much by the other features{(double.IsNaN(p) ? string.Empty : ", " + P(p) + " against sets of this size drawn from the baseline")}"),
                Details = Details(("baseline_vif", reference), ("rows", fit.RowCount)),
                RequiresPersistence = !newRows,
            };
        }

        yield return Condition(input, fit, spread, suffix, rows, alpha) with { RequiresPersistence = !newRows };
    }

    private static Finding Condition(CheckInput input, FitSummary fit, CollinearityNull? spread, string suffix, string rows, double alpha)
    {
        double kappa = fit.ConditionNumber;
        double reference = input.Baseline.ConditionNumber ?? double.NaN;
        double growth = Math.Log10(kappa / reference);
        NearDependency diagnostics = NearDependency.Of(fit.Factor);
        int strongest = Array.IndexOf(diagnostics.ConditionIndices, diagnostics.ConditionIndices.Max());
        double[] shares = diagnostics.Proportions[strongest];
        double proportion = input.Setting(CollinearityCheck.DependencyProportion);
        var members = Enumerable.Range(0, shares.Length).OrderByDescending(j => shares[j]).ToList();
        var involved = members.Where(j => shares[j] >= proportion).Select(j => fit.Layout.Terms[j]).ToList();
        if (involved.Count < 2)
        {
            involved = members.Take(2).Select(j => fit.Layout.Terms[j]).ToList();
        }

        double p = spread is null ? double.NaN : CollinearityNull.UpperTail(kappa, spread.MeanLogCondition, spread.SdLogCondition);
        bool beyondChance = double.IsNaN(p) || p < alpha;
        double dependencyIndex = input.Setting(CollinearityCheck.DependencyIndex);
        bool dependency = diagnostics.ConditionIndices[strongest] >= dependencyIndex && shares.Count(s => s >= proportion) >= 2;
        double alarm = input.Setting(CollinearityCheck.ConditionAlarm);
        bool floors = kappa >= alarm && growth >= input.Setting(CollinearityCheck.ConditionGrowthLog10);
        Severity severity = floors && beyondChance ? Severity.Critical
            : dependency && !(reference >= dependencyIndex) && (double.IsNaN(p) || p < input.Thresholds.WarningAlpha) ? Severity.Warning
            : Severity.Ok;
        var details = Details(("baseline_condition_number", reference), ("strongest_condition_index", diagnostics.ConditionIndices[strongest]), ("rows", fit.RowCount));
        foreach (int j in members.Take(3))
        {
            details["proportion." + fit.Layout.Terms[j]] = shares[j];
        }

        return new Finding
        {
            Check = CheckNames.Collinearity,
            Statistic = "condition_number" + suffix,
            Value = Finite(kappa),
            PValue = Finite(p),
            Alpha = double.IsNaN(p) ? null : alpha,
            Limit = alarm,
            Severity = severity,
            EffectSize = Finite(growth),
            EffectSizeName = "log10_condition_growth",
            Explanation = Fmt($"scaled condition number of {rows} is {Num(kappa)} against {Num(reference)} at baseline (pages at {Num(alarm)}); the strongest near-dependency (index {Num(diagnostics.ConditionIndices[strongest])}) involves {string.Join(" and ", involved)}{(double.IsNaN(p) ? string.Empty : ", " + P(p) + " against sets of this size drawn from the baseline")}"),
            Details = details,
        };
    }
}
