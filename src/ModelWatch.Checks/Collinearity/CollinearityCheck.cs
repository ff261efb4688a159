using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Sequential;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Collinearity;

/// <summary>
/// <c>collinearity</c>, on every run: VIFs and the BKW-scaled condition number of the window's design, and of the
/// rows new since the previous run (which show a new near-dependency a run after it starts, while a long window
/// dilutes it; when one run brings too few, they are gathered over runs), against the baseline. Each is an effect size with a floor (VIF ≥ 10 and twice the baseline; condition
/// number ≥ 100 and 10^0.5 times the baseline) and a null spread from sets of the same size resampled from the
/// baseline rows (<see cref="CollinearityNull"/>), tested at the run's budgeted α; the strongest near-dependency is
/// named from the variance-decomposition proportions (Belsley, Kuh &amp; Welsch 1980). A reading of the window is a per-run
/// test (persistence applies); a reading of new rows is a block that no earlier reading saw, so it pages at once. Loss
/// of numerical rank is critical at once and names the aliased columns.
/// </summary>
public sealed class CollinearityCheck : IModelCheck
{
    /// <summary>Absolute VIF alarm level (Marquardt 1970).</summary>
    public static readonly CheckSetting VifAlarm = new() { Check = CheckNames.Collinearity, Name = "vif_alarm", Default = 10, Minimum = 1, Maximum = 1e12, Description = "VIF at which a feature's coefficient is called unstable (Marquardt 1970, Technometrics 12:591–612)" };

    /// <summary>VIF growth over the baseline.</summary>
    public static readonly CheckSetting VifRatio = new() { Check = CheckNames.Collinearity, Name = "vif_ratio", Default = 2, Minimum = 1, Maximum = 1e12, Description = "growth of a VIF over its baseline value that pages, with the VIF at or above vif_alarm (common practice)" };

    /// <summary>Scaled condition number alarm level.</summary>
    public static readonly CheckSetting ConditionAlarm = new() { Check = CheckNames.Collinearity, Name = "condition_alarm", Default = 100, Minimum = 1, Maximum = 1e16, Description = "BKW-scaled condition number called serious (Belsley 1991, from memory)" };

    /// <summary>Growth of log10 κ over the baseline.</summary>
    public static readonly CheckSetting ConditionGrowthLog10 = new() { Check = CheckNames.Collinearity, Name = "condition_growth_log10", Default = 0.5, Minimum = 0, Maximum = 16, Description = "growth of log10 of the condition number over its baseline value that pages (×3.2; common practice)" };

    /// <summary>Condition index marking a near-dependency.</summary>
    public static readonly CheckSetting DependencyIndex = new() { Check = CheckNames.Collinearity, Name = "dependency_index", Default = 30, Minimum = 1, Maximum = 1e16, Description = "condition index that marks a near-dependency (Belsley, Kuh & Welsch 1980)" };

    /// <summary>Variance-decomposition proportion of a member.</summary>
    public static readonly CheckSetting DependencyProportion = new() { Check = CheckNames.Collinearity, Name = "dependency_proportion", Default = 0.5, Minimum = 0, Maximum = 1, Description = "variance-decomposition proportion that puts a coefficient in a near-dependency (Belsley, Kuh & Welsch 1980)" };

    /// <summary>Rows per coefficient before VIFs are read.</summary>
    public static readonly CheckSetting RowsPerCoefficient = new() { Check = CheckNames.Collinearity, Name = "rows_per_coefficient", Kind = SettingKind.WholeNumber, Default = 10, Minimum = 2, Maximum = 10_000, Description = "rows per coefficient a set needs before its VIFs are read (common practice)" };

    private CollinearityCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static CollinearityCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Collinearity;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [VifAlarm, VifRatio, ConditionAlarm, ConditionGrowthLog10, DependencyIndex, DependencyProportion, RowsPerCoefficient];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } = [new("collinearity", "VIFs and the condition number of the window and of the new rows against their resampled null, every run")];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Collinearity,
        "Features have started to move together (a higher condition number or variance inflation factor than at baseline), so the refit cannot tell their effects apart and coefficient estimates become unstable. Named features form the new near-dependency.",
        "Plot the named features against each other over the window; check whether an upstream change made one a copy or a rescaling of another, or whether a segment of rows is missing.",
        "Predictions may still be fine while the features keep moving together; coefficient alerts on the involved features are then weak evidence. Fix a pipeline fault if there is one; otherwise the owner may drop or combine features at the next retraining.");

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        FitSummary? fit = input.Window.Fit;
        if (fit?.RankDeficiency is { } lost)
        {
            var rank = new Finding
            {
                Check = Name,
                Subject = string.Join(", ", lost.AliasedTerms),
                Statistic = "rank",
                Value = fit.Rank,
                Limit = fit.ParameterCount,
                Severity = Severity.Critical,
                RequiresPersistence = false,
                Explanation = Fmt($"the window's design lost numerical rank ({fit.Rank} of {fit.ParameterCount}): {string.Join("; ", lost.Reasons)}; coefficients of {string.Join(", ", lost.AliasedTerms)} cannot be estimated — check the pipeline that produces these columns"),
            };
            return new CheckResult { Check = Name, State = state, Findings = [rank] };
        }

        int minimum = (int)input.Setting(RowsPerCoefficient) * input.Baseline.ToLayout().ParameterCount;
        CollinearityState memory = state.Read<CollinearityState>();
        if (fit is null || input.Window.RowsAccepted < minimum)
        {
            return new CheckResult { Check = Name, State = state, Findings = [Skip(Name, "vif", SkipReasons.InsufficientData, Fmt($"VIFs are too noisy below {minimum} rows ({input.Setting(RowsPerCoefficient)} per coefficient)"))] };
        }

        // The new rows get their own reading once they are enough, gathered over runs when one run brings too few, and
        // unless they are the whole window already.
        AugmentedFactor? fresh = Increment.Of(input) is { } rows && rows.RowCount < input.Window.RowsAccepted ? rows : null;
        AugmentedFactor? block = fresh is null ? null : memory.Pending is { } pending ? RegressionMath.Merge(pending.ToFactor(fresh.Layout), fresh) : fresh;
        FitSummary? blockFit = block is not null && block.RowCount >= minimum ? LeastSquaresFit.Fit(block) : null;
        int sets = blockFit is { IsFullRank: true } ? 2 : 1;
        double alpha = input.RunAlpha(tests: sets * (input.Baseline.Features.Count + 1));
        var findings = new List<Finding>(CollinearityReading.Read(input, fit, newRows: false, alpha));
        if (blockFit is { IsFullRank: true })
        {
            findings.AddRange(CollinearityReading.Read(input, blockFit, newRows: true, alpha));
        }

        memory = memory with { Pending = blockFit is null && block is not null ? StoredFactor.Of(block) : null };
        return new CheckResult { Check = Name, State = state.With(memory), Findings = findings };
    }
}
