using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Calibration;

/// <summary>A change injected at a run boundary, and the alert meant to catch it.</summary>
/// <param name="Name">Short name.</param>
/// <param name="Description">What changes.</param>
/// <param name="Change">The change applied to rows from the boundary on.</param>
/// <param name="Check">The check meant to catch it.</param>
/// <param name="Subjects">Subjects that count as naming it (null matches a model-level alert).</param>
/// <param name="Target">The median and 95th-percentile delays asked for at ratio 7, in runs.</param>
public sealed record Scenario(string Name, string Description, Shift Change, string Check, IReadOnlyList<string?> Subjects, (int Median, int P95) Target)
{
    /// <summary>A coefficient change raising the deployed MSE by 25 %: x3's coefficient +0.5 with unit-variance features and σ = 1.</summary>
    public static readonly Scenario Coefficient = new("coefficient", "coefficient of x3 +0.5 (deployed MSE +25 %)", new Shift { CoefficientFeature = 2, CoefficientChange = 0.5 }, CheckNames.Coefficients, ["x3"], (3, 5));

    /// <summary>A 1σ shift of one feature's mean.</summary>
    public static readonly Scenario FeatureShift = new("feature", "mean of x4 shifted by 1 σ", new Shift { MeanShiftFeature = 3, MeanShift = 1.0 }, CheckNames.Features, ["x4"], (2, 3));

    /// <summary>An outcome bias of half a residual SD.</summary>
    public static readonly Scenario Bias = new("bias", "outcome bias 0.5 σ", new Shift { Bias = 0.5 }, CheckNames.Residuals, [null], (1, 2));

    /// <summary>A feature pair becoming near-collinear.</summary>
    public static readonly Scenario Collinear = new("collinear", "x2 made 0.99-correlated with x1", new Shift { CorrelateFeature = 1, CorrelateWith = 0, Correlation = 0.99 }, CheckNames.Collinearity, ["x1", "x2", null], (2, 3));

    /// <summary>The four scenarios of the calibration.</summary>
    public static IReadOnlyList<Scenario> All { get; } = [Coefficient, FeatureShift, Bias, Collinear];

    /// <summary>Whether an alert decision opens the alert meant for this change.</summary>
    public bool Catches(AlertDecision decision) => decision.Action == AlertAction.Open && decision.Check == Check && Subjects.Contains(decision.Subject);

    /// <summary>Whether an alert decision opens an alert of the right check that names something else.</summary>
    public bool Misnames(AlertDecision decision) => decision.Action == AlertAction.Open && decision.Check == Check && decision.Subject is not null && !Subjects.Contains(decision.Subject);
}
