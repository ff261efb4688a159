using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Serving;

/// <summary>
/// <c>serving</c>: when the query returns the prediction production served, compares it with the deployed
/// coefficients' prediction on every row. Disagreement means production is not running the registered
/// coefficients (a stale coefficient file, a feature transform that changed). A hard fault: no budget.
/// </summary>
public sealed class ServingCheck : IModelCheck
{
    /// <summary>Share of disagreeing served predictions that is critical (common practice).</summary>
    public static readonly CheckSetting ServedMismatchCritical = new() { Check = CheckNames.Serving, Name = "served_mismatch_critical", Default = 0.005, Minimum = 0, Maximum = 1, Description = "share of served predictions that disagree with the deployed coefficients before the finding is critical (common practice)" };

    private ServingCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static ServingCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Serving;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [ServedMismatchCritical];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } = [];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Serving,
        "The predictions production served differ from the deployed coefficients applied to the same rows: production is probably not running the coefficients registered as the baseline.",
        "Compare the coefficient file or table production loads with `modelwatch baseline` for the model; look at when the mismatch began against deployment records.",
        "Bring production and the registered baseline back in line: redeploy the intended coefficients, or register the coefficients production really uses as a new baseline.");

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        WindowSummary window = input.Window;
        if (window.ServedCount == 0)
        {
            return new CheckResult { Check = Name, State = state, Findings = [Skip(Name, "served_mismatch", SkipReasons.NoServedPredictions, "the rows carry no served prediction, so serving cannot be compared")] };
        }

        double share = (double)window.ServedMismatchCount / window.ServedCount;
        double critical = input.Setting(ServedMismatchCritical);
        Severity severity = share >= critical ? Severity.Critical : window.ServedMismatchCount > 0 ? Severity.Warning : Severity.Ok;
        var finding = new Finding
        {
            Check = Name,
            Statistic = "served_mismatch",
            Value = share,
            Limit = critical,
            Severity = severity,
            RequiresPersistence = false,
            EffectSize = Finite(window.ServedMaximumDifference),
            EffectSizeName = "max_abs_difference",
            Explanation = window.ServedMismatchCount == 0
                ? Fmt($"all {window.ServedCount} served predictions match the deployed coefficients ({Pct(share)} differ; critical at {Share(critical)})")
                : Fmt($"{window.ServedMismatchCount} of {window.ServedCount} served predictions ({Pct(share)}; critical at {Share(critical)}) differ from the deployed coefficients (largest gap {Num(window.ServedMaximumDifference)}, mean {Num(window.ServedMeanDifference)}): production may be serving a stale coefficient file"),
            Details = Details(("mean_difference", window.ServedMeanDifference), ("max_abs_difference", window.ServedMaximumDifference)),
        };
        return new CheckResult { Check = Name, State = state, Findings = [finding] };
    }
}
