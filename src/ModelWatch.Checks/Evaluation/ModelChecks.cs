using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// Runs every check for one model and window. Pure: the same baseline, summary, states and thresholds give the
/// same findings and new states. When the data check finds too few rows, every other check is <c>skipped</c>
/// with <c>insufficient_data</c> and keeps its state.
/// </summary>
public static class ModelChecks
{
    /// <summary>Runs all checks; <paramref name="states"/> maps check name to its persisted state (missing = fresh).</summary>
    public static IReadOnlyList<CheckResult> Run(
        BaselineReference baseline,
        WindowSummary window,
        DateTimeOffset windowStart,
        DateTimeOffset windowEnd,
        IReadOnlyDictionary<string, CheckState>? states,
        CheckThresholds? thresholds = null)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(window);
        if (windowEnd < windowStart)
        {
            throw new ArgumentException("The window ends before it starts.", nameof(windowEnd));
        }

        CheckInput InputFor(string check) => new()
        {
            Baseline = baseline,
            Window = window,
            WindowStart = windowStart,
            WindowEnd = windowEnd,
            State = states is not null && states.TryGetValue(check, out CheckState? s) ? s : null,
            Thresholds = thresholds ?? new CheckThresholds(),
        };

        var results = new List<CheckResult> { DataCheck.Run(InputFor(CheckNames.Data)) };
        CheckResult data = results[0];
        foreach (string check in CheckNames.All.Where(c => c != CheckNames.Data))
        {
            CheckInput input = InputFor(check);
            if (data.Skipped)
            {
                results.Add(new CheckResult
                {
                    Check = check,
                    State = input.CurrentState,
                    Skipped = true,
                    SkipReason = SkipReasons.InsufficientData,
                    Findings = [Skip(check, "all", SkipReasons.InsufficientData, Fmt($"{window.RowsAccepted} usable rows, below the minimum of {input.MinimumRows}"))],
                });
                continue;
            }

            results.Add(check switch
            {
                CheckNames.Serving => ServingCheck.Run(input),
                CheckNames.Coefficients => CoefficientsCheck.Run(input),
                CheckNames.Collinearity => CollinearityCheck.Run(input),
                CheckNames.Residuals => ResidualsCheck.Run(input),
                CheckNames.Error => ErrorCheck.Run(input),
                CheckNames.Features => FeaturesCheck.Run(input),
                _ => throw new InvalidOperationException("Unknown check " + check),
            });
        }

        return results;
    }
}
