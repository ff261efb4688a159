using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>collinearity</c> (methods.md §4): VIFs and the BKW-scaled condition number of the window's design against the
/// baseline, the features of the strongest near-dependency from variance-decomposition proportions, and loss of
/// numerical rank (a critical finding naming the columns; the run itself did its job). Uses the window's refit
/// factor (every row).
/// </summary>
public static class CollinearityCheck
{
    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Collinearity;
        CheckState state = input.CurrentState;
        FitSummary? fit = input.Window.Fit;
        if (fit?.RankDeficiency is { } lost)
        {
            var rank = new Finding
            {
                Check = check,
                Subject = string.Join(", ", lost.AliasedTerms),
                Statistic = "rank",
                Value = fit.Rank,
                Threshold = fit.ParameterCount,
                Severity = Severity.Critical,
                RequiresPersistence = false,
                Explanation = Fmt($"the window's design lost numerical rank ({fit.Rank} of {fit.ParameterCount}): {string.Join("; ", lost.Reasons)}; coefficients of {string.Join(", ", lost.AliasedTerms)} cannot be estimated — check the pipeline that produces these columns"),
            };
            return new CheckResult { Check = check, State = state, Findings = [rank] };
        }

        if (!input.FixedSampleDue)
        {
            return NotDue(check, state, "vif", "collinearity is compared");
        }

        if (fit is null || input.Window.RowsAccepted < 10L * fit.ParameterCount)
        {
            return new CheckResult { Check = check, State = state, Findings = [Skip(check, "vif", SkipReasons.InsufficientData, "VIFs are too noisy below 10 rows per coefficient (methods.md §4.4)")] };
        }

        BaselineReference baseline = input.Baseline;
        var findings = new List<Finding>();
        var t = input.Thresholds;
        foreach ((string feature, double vif) in fit.VarianceInflationFactors)
        {
            double reference = baseline.VarianceInflationFactors.TryGetValue(feature, out double r) ? r : double.NaN;
            double ratio = vif / reference;
            Severity severity = vif >= t.VifAlarm && ratio >= t.VifRatio ? Severity.Critical
                : vif >= t.VifAlarm || (ratio >= t.VifRatio && vif >= t.VifAlarm / 2.0) ? Severity.Warning
                : Severity.Ok;
            findings.Add(new Finding
            {
                Check = check,
                Subject = feature,
                Statistic = "vif",
                Value = Finite(vif),
                Threshold = t.VifAlarm,
                Severity = severity,
                EffectSize = Finite(ratio),
                EffectSizeName = "vif_ratio",
                Explanation = Fmt($"VIF of {feature} is {Num(vif)} against {Num(reference)} at baseline (×{Num(ratio)}): its coefficient's variance is inflated that much by the other features"),
                Details = Details(("baseline_vif", reference)),
            });
        }

        findings.Add(Condition(input, fit));
        return new CheckResult { Check = check, State = state with { LastTestedWindowEnd = input.WindowEnd }, Findings = findings };
    }

    private static Finding Condition(CheckInput input, FitSummary fit)
    {
        var t = input.Thresholds;
        double kappa = fit.ConditionNumber;
        double reference = input.Baseline.ConditionNumber ?? double.NaN;
        double growth = Math.Log10(kappa / reference);
        NearDependency diagnostics = NearDependency.Of(fit.Factor);
        int strongest = Array.IndexOf(diagnostics.ConditionIndices, diagnostics.ConditionIndices.Max());
        double[] shares = diagnostics.Proportions[strongest];
        var members = Enumerable.Range(0, shares.Length).OrderByDescending(j => shares[j]).ToList();
        var involved = members.Where(j => shares[j] >= t.DependencyProportion).Select(j => fit.Layout.Terms[j]).ToList();
        if (involved.Count < 2)
        {
            involved = members.Take(2).Select(j => fit.Layout.Terms[j]).ToList();
        }

        bool dependency = diagnostics.ConditionIndices[strongest] >= t.DependencyIndex && shares.Count(s => s >= t.DependencyProportion) >= 2;
        Severity severity = kappa >= t.ConditionAlarm && growth >= t.ConditionGrowthLog10 ? Severity.Critical
            : dependency && !(reference >= t.DependencyIndex) ? Severity.Warning
            : Severity.Ok;
        var details = Details(("baseline_condition_number", reference), ("strongest_condition_index", diagnostics.ConditionIndices[strongest]));
        foreach (int j in members.Take(3))
        {
            details["proportion." + fit.Layout.Terms[j]] = shares[j];
        }

        return new Finding
        {
            Check = CheckNames.Collinearity,
            Statistic = "condition_number",
            Value = Finite(kappa),
            Threshold = t.ConditionAlarm,
            Severity = severity,
            EffectSize = Finite(growth),
            EffectSizeName = "log10_condition_growth",
            Explanation = Fmt($"scaled condition number {Num(kappa)} against {Num(reference)} at baseline; strongest near-dependency (index {Num(diagnostics.ConditionIndices[strongest])}) involves {string.Join(" and ", involved)}"),
            Details = details,
        };
    }
}
