using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>serving</c>: when the query returns the prediction production served, compares it with the deployed
/// coefficients' prediction on every row. Disagreement means production is not running the registered
/// coefficients (a stale coefficient file, a feature transform that changed).
/// </summary>
public static class ServingCheck
{
    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Serving;
        CheckState state = input.CurrentState;
        WindowSummary window = input.Window;
        if (window.ServedCount == 0)
        {
            return new CheckResult { Check = check, State = state, Findings = [Skip(check, "served_mismatch", SkipReasons.NoServedPredictions, "the rows carry no served prediction, so serving cannot be compared")] };
        }

        double share = (double)window.ServedMismatchCount / window.ServedCount;
        Severity severity = share >= input.Thresholds.ServedMismatchCritical ? Severity.Critical : window.ServedMismatchCount > 0 ? Severity.Warning : Severity.Ok;
        var finding = new Finding
        {
            Check = check,
            Statistic = "served_mismatch",
            Value = share,
            Threshold = input.Thresholds.ServedMismatchCritical,
            Severity = severity,
            RequiresPersistence = false,
            EffectSize = Finite(window.ServedMaximumDifference),
            EffectSizeName = "max_abs_difference",
            Explanation = window.ServedMismatchCount == 0
                ? Fmt($"all {window.ServedCount} served predictions match the deployed coefficients")
                : Fmt($"{window.ServedMismatchCount} of {window.ServedCount} served predictions ({Pct(share)}) differ from the deployed coefficients (largest gap {Num(window.ServedMaximumDifference)}, mean {Num(window.ServedMeanDifference)}): production may be serving a stale coefficient file"),
            Details = Details(("mean_difference", window.ServedMeanDifference), ("max_abs_difference", window.ServedMaximumDifference)),
        };
        return new CheckResult { Check = check, State = state, Findings = [finding] };
    }
}
