using ModelWatch.Checks.Findings;

namespace ModelWatch.Cli.Reports;

/// <summary>
/// The runbook entry of each check: what it means, how to confirm it, what to do. The one source of this text:
/// <c>explain</c> prints it, the evidence report shows it, and docs/operations.md's runbook repeats it word for word
/// (a test compares them).
/// </summary>
internal static class RunbookHints
{
    /// <summary>Said wherever evidence is shown, because an alert can tempt someone into a costly retrain or rollback.</summary>
    public const string Caution =
        "An alert is statistical evidence, not proof: it says the change is unlikely to be chance and large enough to matter, " +
        "not why it happened. Retraining or rolling back the model is a decision for the model's owner.";

    /// <summary>Runbook entries in the order a run evaluates the checks.</summary>
    public static readonly IReadOnlyList<RunbookHint> All =
    [
        new(CheckNames.Data,
            "The rows themselves are unhealthy: too few rows, many rows rejected for missing or non-finite values, a feature that stopped varying, or a source that brought no new rows for several runs.",
            "Count the rows of the window in the data source with the model's query; look at the rejected-row counts per column in the run; check whether the upstream job that fills the table ran.",
            "Fix the feed first: every other check of the model is unreliable while its input is broken. Expect the other checks to settle once healthy rows arrive."),
        new(CheckNames.Serving,
            "The predictions production served differ from the deployed coefficients applied to the same rows: production is probably not running the coefficients registered as the baseline.",
            "Compare the coefficient file or table production loads with `modelwatch baseline` for the model; look at when the mismatch began against deployment records.",
            "Bring production and the registered baseline back in line: redeploy the intended coefficients, or register the coefficients production really uses as a new baseline."),
        new(CheckNames.Coefficients,
            "A refit on the window's rows disagrees with the deployed coefficients by more than their joint uncertainty allows, and the disagreement is large enough to raise the model's error: the relationship between features and outcome has changed.",
            "Look at the coefficient trajectories in the evidence report: a step that persists over several runs is a change; a single spike usually is not. Ask whether something changed in the process the model describes (a tariff, a route, a policy) around the first critical run.",
            "Tell the model's owner which coefficients moved and by how much. If the change is real and lasting, the owner decides whether to retrain and register a new baseline; until then, expect predictions to be biased in the direction shown."),
        new(CheckNames.Collinearity,
            "Features have started to move together (a higher condition number or variance inflation factor than at baseline), so the refit cannot tell their effects apart and coefficient estimates become unstable. Named features form the new near-dependency.",
            "Plot the named features against each other over the window; check whether an upstream change made one a copy or a rescaling of another, or whether a segment of rows is missing.",
            "Predictions may still be fine while the features keep moving together; coefficient alerts on the involved features are then weak evidence. Fix a pipeline fault if there is one; otherwise the owner may drop or combine features at the next retraining."),
        new(CheckNames.Residuals,
            "The errors of the deployed model have changed shape: a bias, a new spread, a different distribution, variance that depends on the features, or errors that follow each other in time. A CUSUM alert means a small shift has persisted over many runs.",
            "Compare the residual distribution of the baseline with the window in the evidence report; look at the bias and spread findings' values; check the outcome's measurement (a sensor, a unit, a time zone) for a recent change.",
            "A bias with unchanged coefficients often means the outcome's measurement moved: fix the measurement, not the model. A new spread means predictions are less certain than advertised; tell the consumers of the predictions."),
        new(CheckNames.Error,
            "The deployed coefficients predict the window's outcome worse than at baseline, beyond what chance explains. The decomposition says how much of the increase is noise (a harder window), level drift (an overall bias) and slope drift (changed coefficients).",
            "Read the decomposition shares: mostly noise points to the data, mostly drift points to a changed relationship. Check the error chart for a step rather than a spike.",
            "If drift dominates, follow the coefficients entry; if noise dominates, look at the residuals and data entries. Report the size of the error increase to the model's owner, who decides whether it matters for the business."),
        new(CheckNames.Features,
            "The distribution of a feature has moved away from the baseline (population stability index or Kolmogorov–Smirnov), or more rows than expected lie outside the design the model was fitted on (extrapolation).",
            "Look at PSI by feature in the evidence report and at the feature's recent values in the data source; ask whether the population served has changed (a new region, a new product) or a pipeline changed units.",
            "Drift alone does not mean the model is wrong, only that it is used where it was not fitted; watch the coefficients and error checks. A unit or pipeline change is a data fix; a new population may need a retraining on representative rows."),
    ];

    /// <summary>The entry of a check, or null for an unknown check name.</summary>
    public static RunbookHint? For(string check) => All.FirstOrDefault(h => h.Check == check);
}
