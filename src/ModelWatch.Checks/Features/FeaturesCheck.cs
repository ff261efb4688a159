using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Features;

/// <summary>
/// <c>features</c>. On every run, on the window: per feature the population stability index against the baseline's
/// quantile bins (every row) with its sample-size-aware null, and a two-sample Kolmogorov–Smirnov against the
/// reference sample (Holm across features); for the model, the share of rows whose leverage exceeds the reference's
/// 99th percentile. On the rows new since the previous run: a location CUSUM and a bin-share CUSUM per feature, and a
/// leverage-exceedance CUSUM (<see cref="FeatureCusums"/>), so a shifted feature is seen within a run or two.
/// </summary>
public sealed class FeaturesCheck : IModelCheck
{
    /// <summary>PSI for a critical feature drift.</summary>
    public static readonly CheckSetting PsiCritical = new() { Check = CheckNames.Features, Name = "psi_critical", Default = 0.25, Minimum = 0, Maximum = 100, Description = "PSI for a critical feature drift (common practice in credit scoring; no primary source)" };

    /// <summary>PSI for a warning.</summary>
    public static readonly CheckSetting PsiWarning = new() { Check = CheckNames.Features, Name = "psi_warning", Default = 0.10, Minimum = 0, Maximum = 100, Description = "PSI for a warning (common practice)" };

    /// <summary>Kolmogorov–Smirnov distance floor.</summary>
    public static readonly CheckSetting KsFloor = new() { Check = CheckNames.Features, Name = "ks_floor", Default = 0.10, Minimum = 0, Maximum = 1, Description = "smallest Kolmogorov–Smirnov distance of a feature that pages (common practice)" };

    /// <summary>Leverage-exceedance excess over the reference share.</summary>
    public static readonly CheckSetting LeverageExcessFloor = new() { Check = CheckNames.Features, Name = "leverage_excess_floor", Default = 0.02, Minimum = 0, Maximum = 1, Description = "excess share of rows beyond the reference's 99th-percentile leverage that pages (common practice)" };

    /// <summary>Location shift floor in reference SDs.</summary>
    public static readonly CheckSetting LocationFloor = new() { Check = CheckNames.Features, Name = "location_floor", Default = 0.5, Minimum = 0, Maximum = 100, Description = "smallest shift of a feature's mean, in reference SDs, that pages from the location CUSUM (a normal feature shifted by 0.5 SD has a PSI near the 0.25 cut-off)" };

    private FeaturesCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static FeaturesCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Features;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [PsiCritical, PsiWarning, KsFloor, LeverageExcessFloor, LocationFloor];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } =
    [
        new("features.psi", "PSI of each feature on the window, every run (split over the features)"),
        new("features.ks", "Kolmogorov–Smirnov of each feature on the window, every run (Holm over the features)"),
        new("features.leverage", "leverage exceedances on the window, every run"),
        new("features.location_cusum", "Page CUSUM of each feature's mean on the rows new since the previous run"),
        new("features.shape_cusum", "one-sided CUSUM of each feature's bin shares on the new rows"),
        new("features.leverage_cusum", "one-sided CUSUM of leverage exceedances on the new rows"),
    ];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Features,
        "The distribution of a feature has moved away from the baseline (population stability index, Kolmogorov–Smirnov, or a CUSUM of the newest rows' mean or bin shares), or more rows than expected lie outside the design the model was fitted on (extrapolation).",
        "Look at PSI by feature in the evidence report and at the feature's recent values in the data source; ask whether the population served has changed (a new region, a new product) or a pipeline changed units.",
        "Drift alone does not mean the model is wrong, only that it is used where it was not fitted; watch the coefficients and error checks. A unit or pipeline change is a data fix; a new population may need a retraining on representative rows.");

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        (IReadOnlyList<Finding> sequential, FeaturesState memory) = FeatureCusums.Step(input, state.Read<FeaturesState>());
        var findings = new List<Finding>(sequential);
        findings.AddRange(FeatureWindowTests.Run(input));
        return new CheckResult { Check = Name, State = state.With(memory), Findings = findings };
    }
}
