using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Data;

/// <summary>
/// <c>data</c>: rows below the minimum (the run is <c>skipped</c> with <c>insufficient_data</c>, never <c>ok</c>),
/// rows rejected and why, features that became constant, and a source that went quiet (no new rows for several runs
/// in a row: a dead feed is an alert, not silence). Hard faults: they open alerts at once and spend no budget.
/// </summary>
public sealed class DataCheck : IModelCheck
{
    /// <summary>Runs without new rows that mark a dead feed (common practice).</summary>
    public static readonly CheckSetting QuietRuns = new() { Check = CheckNames.Data, Name = "quiet_runs", Kind = SettingKind.WholeNumber, Default = 3, Minimum = 1, Maximum = 1000, Description = "consecutive runs without new rows that mark a dead feed (common practice)" };

    /// <summary>Share of rejected rows that warns (common practice).</summary>
    public static readonly CheckSetting RejectedShareWarning = new() { Check = CheckNames.Data, Name = "rejected_share_warning", Default = 0.01, Minimum = 0, Maximum = 1, Description = "share of rows rejected for NULL/NaN/∞ that warns (common practice)" };

    /// <summary>Share of rejected rows that is critical (common practice).</summary>
    public static readonly CheckSetting RejectedShareCritical = new() { Check = CheckNames.Data, Name = "rejected_share_critical", Default = 0.10, Minimum = 0, Maximum = 1, Description = "share of rows rejected for NULL/NaN/∞ that is critical (common practice)" };

    private DataCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static DataCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Data;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [QuietRuns, RejectedShareWarning, RejectedShareCritical];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } = [];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Data,
        "The rows themselves are unhealthy: too few rows, many rows rejected for missing or non-finite values, a feature that stopped varying, or a source that brought no new rows for several runs.",
        "Count the rows of the window in the data source with the model's query; look at the rejected-row counts per column in the run; check whether the upstream job that fills the table ran.",
        "Fix the feed first: every other check of the model is unreliable while its input is broken. Expect the other checks to settle once healthy rows arrive.");

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        DataState memory = state.Read<DataState>();
        WindowSummary window = input.Window;

        // A quiet source brings no new rows; with an overlapping window the window itself empties only much later.
        int empty = (window.NewRows?.RowCount ?? 0) == 0 ? memory.ConsecutiveEmptyRuns + 1 : 0;
        CheckState next = state.With(memory with { ConsecutiveEmptyRuns = empty });
        var findings = new List<Finding>();
        int quietRuns = (int)input.Setting(QuietRuns);
        if (empty > 0)
        {
            bool dead = empty >= quietRuns;
            findings.Add(new Finding
            {
                Check = Name,
                Statistic = "quiet_source",
                Value = empty,
                Limit = quietRuns,
                Severity = dead ? Severity.Critical : Severity.Warning,
                RequiresPersistence = false,
                Explanation = dead
                    ? Fmt($"the data source brought no new usable rows for {empty} runs in a row (alert at {quietRuns}): the feed looks dead; check the query and the upstream pipeline")
                    : Fmt($"the data source brought no new usable rows this run ({empty} in a row; alert at {quietRuns})"),
            });
        }

        if (window.RowsRejected > 0)
        {
            double share = (double)window.RowsRejected / window.RowsRead;
            double critical = input.Setting(RejectedShareCritical);
            string columns = string.Join(", ", window.NonFiniteByColumn.Select(kv => Fmt($"{kv.Key} ({kv.Value})")));
            findings.Add(new Finding
            {
                Check = Name,
                Statistic = "rejected_rows",
                Value = share,
                Limit = critical,
                Severity = share >= critical ? Severity.Critical : share >= input.Setting(RejectedShareWarning) ? Severity.Warning : Severity.Ok,
                EffectSize = share,
                EffectSizeName = "rejected_share",
                Explanation = Fmt($"{window.RowsRejected} of {window.RowsRead} rows ({Pct(share)}; critical at {Share(critical)}) were rejected for NULL, NaN or infinite values in: {columns}"),
                Details = window.NonFiniteByColumn.ToDictionary(kv => "non_finite." + kv.Key, kv => (double)kv.Value, StringComparer.Ordinal),
            });
        }

        foreach (string feature in window.ConstantFeatures)
        {
            ColumnSummary column = window.Columns.First(c => c.Name == feature);
            findings.Add(new Finding
            {
                Check = Name,
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
            findings.Add(Skip(Name, "rows", SkipReasons.InsufficientData, Fmt($"{window.RowsAccepted} usable rows, the minimum is {input.MinimumRows} (max(30, 10p) unless set): no test ran, which is not the same as ok")));
            return new CheckResult { Check = Name, State = next, Findings = findings, Skipped = true, SkipReason = SkipReasons.InsufficientData };
        }

        findings.Add(new Finding
        {
            Check = Name,
            Statistic = "rows",
            Value = window.RowsAccepted,
            Limit = input.MinimumRows,
            Severity = Severity.Ok,
            Explanation = Fmt($"{window.RowsAccepted} usable rows (minimum {input.MinimumRows})"),
        });
        return new CheckResult { Check = Name, State = next, Findings = findings };
    }
}
