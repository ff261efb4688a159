using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Sequential;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Coefficients;

/// <summary>
/// <c>coefficients</c>: has the relationship between features and outcome moved away from the deployed coefficients?
/// On every run: the window's refit against the deployed coefficients (Wald, Chow, z per coefficient;
/// <see cref="WaldEvidence"/>); the structural-change monitors with the window as moving window (moving estimates per
/// slope, OLS-MOSUM, OLS-CUSUM; <see cref="StructuralChangeMonitors"/>); and a CUSUM per slope on the new rows
/// (<see cref="CoefficientCusums"/>). Every paging finding also needs the drift to matter for predictions.
/// </summary>
public sealed class CoefficientsCheck : IModelCheck
{
    /// <summary>Predictive impact floor <c>D = δᵀSδ/s²_ref</c>.</summary>
    public static readonly CheckSetting DriftImpactFloor = new() { Check = CheckNames.Coefficients, Name = "drift_impact_floor", Default = 0.10, Minimum = 0, Maximum = 100, Description = "smallest rise of the deployed model's MSE, as a share of s²_ref, that coefficient drift must cause to page (common practice)" };

    private CoefficientsCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static CoefficientsCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Coefficients;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [DriftImpactFloor];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } =
    [
        new("coefficients.wald", "Wald test of the window's refit (and, under it, the z per coefficient), every run"),
        new("coefficients.moving_estimates", "moving-estimates monitor, one component per slope, over an epoch"),
        new("coefficients.level_monitors", "OLS-MOSUM and OLS-CUSUM monitors of the fit's level, over an epoch (half each)"),
        new("coefficients.cusum", "Page CUSUM per slope on the rows new since the previous run"),
    ];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Coefficients,
        "The relationship between features and outcome has changed: a refit on recent rows disagrees with the deployed coefficients by more than their joint uncertainty allows, and the disagreement is large enough to raise the model's error. A named coefficient is the one that moved.",
        "Look at the coefficient trajectories in the evidence report: a step that persists over several runs is a change; a single spike usually is not. Ask whether something changed in the process the model describes (a tariff, a route, a policy) around the first critical run.",
        "Tell the model's owner which coefficients moved and by how much. If the change is real and lasting, the owner decides whether to retrain and register a new baseline; until then, expect predictions to be biased in the direction shown.");

    /// <summary>How much a coefficient's (or, with a negative index, the level's) move would cost predictions, in words.</summary>
    internal static string Impact(PredictiveImpact? recent, int term, double floor)
    {
        if (recent is null)
        {
            return "no refit to measure what the move costs";
        }

        double share = term >= 0 ? recent.PerCoefficient[term] : recent.Level;
        string what = term >= 0 ? "this move alone" : "this level shift alone";
        return Fmt($"{what} would raise the MSE of the {(recent.OnNewRows ? "new" : "window's")} {recent.Rows} rows by {Pct(share)} beyond noise (floor {Pct(floor)})");
    }

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        CoefficientsState memory = state.Read<CoefficientsState>();
        FitSummary? fit = input.Window.Fit;
        var findings = new List<Finding>();
        if (fit is null || !fit.IsFullRank || fit.ResidualDegreesOfFreedom <= 0)
        {
            string why = fit?.RankDeficiency is { } rd ? "the window's refit lost rank (" + string.Join(", ", rd.AliasedTerms) + ")" : "the window has too few rows to refit";
            findings.Add(Skip(Name, "wald", SkipReasons.RankDeficient, why + "; coefficients cannot be compared"));
        }
        else
        {
            findings.AddRange(WaldEvidence.Run(input, fit));
        }

        PredictiveImpact? recent = PredictiveImpact.Recent(input);
        Finding? unmarked = Increment.Unmarked(input, Name, "cusum");
        (IReadOnlyList<Finding> monitors, memory) = StructuralChangeMonitors.Step(input, memory, recent, incrementUsable: unmarked is null);
        findings.AddRange(monitors);
        if (unmarked is not null)
        {
            findings.Add(unmarked);
        }
        else
        {
            (IReadOnlyList<Finding> cusums, memory) = CoefficientCusums.Step(input, memory, recent);
            findings.AddRange(cusums);
        }

        return new CheckResult { Check = Name, State = state.With(memory), Findings = findings };
    }
}
