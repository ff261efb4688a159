using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// Runs every registered check (<see cref="CheckRegistry"/>) for one model and window. Pure: the same baseline,
/// summary, states and settings give the same findings and new states. When the data check finds too few rows, every
/// other check is <c>skipped</c> with <c>insufficient_data</c> and keeps its state.
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
        CheckThresholds? thresholds = null,
        DateTimeOffset? newestRowTime = null)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(window);
        if (windowEnd < windowStart)
        {
            throw new ArgumentException("The window ends before it starts.", nameof(windowEnd));
        }

        thresholds ??= new CheckThresholds();
        var results = new List<CheckResult>();
        bool insufficient = false;
        foreach (IModelCheck check in CheckRegistry.All)
        {
            var input = new CheckInput
            {
                Baseline = baseline,
                Window = window,
                WindowStart = windowStart,
                WindowEnd = windowEnd,
                State = states is not null && states.TryGetValue(check.Name, out CheckState? s) ? s : null,
                Thresholds = thresholds,
                NewestRowTime = newestRowTime,
            };
            CheckResult result;
            if (insufficient)
            {
                result = new CheckResult
                {
                    Check = check.Name,
                    State = input.CurrentState,
                    Skipped = true,
                    SkipReason = SkipReasons.InsufficientData,
                    Findings = [Skip(check.Name, "all", SkipReasons.InsufficientData, Fmt($"{window.RowsAccepted} usable rows, below the minimum of {input.MinimumRows}"))],
                };
            }
            else
            {
                result = check.Run(input);
                result = result with { State = result.State with { Runs = result.State.Runs + 1 } };
            }

            // Every run moves the window on, evaluated or not: rows before this end are not new to the next run.
            results.Add(result with { State = result.State with { LastRunEnd = windowEnd } });
            insufficient |= check.Name == CheckNames.Data && result.Skipped;
        }

        return results;
    }
}
