using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// <c>data</c>: rows below the minimum (the run is <c>skipped</c> with <c>insufficient_data</c>, never <c>ok</c>),
/// rows rejected and why, features that became constant, and a source that went quiet (no rows for several runs
/// in a row: a dead feed is an alert, not silence). Runs on every run.
/// </summary>
public static class DataCheck
{
    /// <summary>Runs the check.</summary>
    public static CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        const string check = CheckNames.Data;
        CheckState state = input.CurrentState;
        WindowSummary window = input.Window;
        var t = input.Thresholds;
        // A quiet source brings no new rows; with an overlapping window the window itself empties only much later.
        int empty = (window.NewRows?.RowCount ?? 0) == 0 ? state.ConsecutiveEmptyRuns + 1 : 0;
        CheckState next = state with { ConsecutiveEmptyRuns = empty };
        var findings = new List<Finding>();
        if (empty > 0)
        {
            bool dead = empty >= t.QuietRuns;
            findings.Add(new Finding
            {
                Check = check,
                Statistic = "quiet_source",
                Value = empty,
                Threshold = t.QuietRuns,
                Severity = dead ? Severity.Critical : Severity.Warning,
                RequiresPersistence = false,
                Explanation = dead
                    ? Fmt($"the data source brought no new usable rows for {empty} runs in a row: the feed looks dead; check the query and the upstream pipeline")
                    : Fmt($"the data source brought no new usable rows this run ({empty} in a row; alert at {t.QuietRuns})"),
            });
        }

        if (window.RowsRejected > 0)
        {
            double share = (double)window.RowsRejected / window.RowsRead;
            string columns = string.Join(", ", window.NonFiniteByColumn.Select(kv => Fmt($"{kv.Key} ({kv.Value})")));
            findings.Add(new Finding
            {
                Check = check,
                Statistic = "rejected_rows",
                Value = share,
                Threshold = t.RejectedShareCritical,
                Severity = share >= t.RejectedShareCritical ? Severity.Critical : share >= t.RejectedShareWarning ? Severity.Warning : Severity.Ok,
                EffectSize = share,
                EffectSizeName = "rejected_share",
                Explanation = Fmt($"{window.RowsRejected} of {window.RowsRead} rows ({Pct(share)}) were rejected for NULL, NaN or infinite values in: {columns}"),
                Details = window.NonFiniteByColumn.ToDictionary(kv => "non_finite." + kv.Key, kv => (double)kv.Value, StringComparer.Ordinal),
            });
        }

        foreach (string feature in window.ConstantFeatures)
        {
            ModelWatch.Numerics.Regression.ColumnSummary column = window.Columns.First(c => c.Name == feature);
            findings.Add(new Finding
            {
                Check = check,
                Subject = feature,
                Statistic = "constant_feature",
                Value = column.Minimum,
                Severity = Severity.Critical,
                RequiresPersistence = false,
                Explanation = Fmt($"feature {feature} took the single value {Num(column.Minimum)} in all {column.Count} rows: it duplicates the intercept, which is nearly always a pipeline fault"),
            });
        }

        if (window.RowsAccepted < input.MinimumRows)
        {
            findings.Add(Skip(check, "rows", SkipReasons.InsufficientData, Fmt($"{window.RowsAccepted} usable rows, the minimum is {input.MinimumRows} (max(30, 10p) unless set): no test ran, which is not the same as ok")));
            return new CheckResult { Check = check, State = next, Findings = findings, Skipped = true, SkipReason = SkipReasons.InsufficientData };
        }

        findings.Add(new Finding
        {
            Check = check,
            Statistic = "rows",
            Value = window.RowsAccepted,
            Threshold = input.MinimumRows,
            Severity = Severity.Ok,
            Explanation = Fmt($"{window.RowsAccepted} usable rows (minimum {input.MinimumRows})"),
        });
        return new CheckResult { Check = check, State = next, Findings = findings };
    }
}
