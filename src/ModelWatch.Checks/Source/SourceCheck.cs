using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using static ModelWatch.Checks.Evaluation.FindingText;

namespace ModelWatch.Checks.Source;

/// <summary>
/// <c>source</c>: whether the model is being watched at all. Runs that fail (a query error, a wrong password, a
/// source that is down) leave every other check silent, so this check counts them: after
/// <see cref="MaxFailedRuns"/> failures in a row, or failures for longer than <see cref="MaxFailingHours"/>, it is
/// critical and opens an alert at once; the first run that reads its window clears it. It also measures the age of
/// the newest row at the window's end, which catches a source that answers but stopped filling. Hard faults: they spend
/// no false-alarm budget. It is evaluated on every run, failed ones included, and never skipped for want of rows.
/// </summary>
public sealed class SourceCheck : IModelCheck
{
    /// <summary>Failed runs in a row that open the alert (common practice).</summary>
    public static readonly CheckSetting MaxFailedRuns = new() { Check = CheckNames.Source, Name = "max_failed_runs", Kind = SettingKind.WholeNumber, Default = 3, Minimum = 1, Maximum = 1000, Description = "failed runs in a row that open the source alert (common practice)" };

    /// <summary>Hours of failing runs that open the alert sooner; 0 turns the limit off.</summary>
    public static readonly CheckSetting MaxFailingHours = new() { Check = CheckNames.Source, Name = "max_failing_hours", Default = 0, Minimum = 0, Maximum = 8760, Description = "hours since the first of a series of failed runs that open the source alert even before max_failed_runs; 0 turns the limit off" };

    /// <summary>Hours between the window's end and the newest row that open the alert; 0 turns the limit off.</summary>
    public static readonly CheckSetting MaxDataAgeHours = new() { Check = CheckNames.Source, Name = "max_data_age_hours", Default = 0, Minimum = 0, Maximum = 87600, Description = "hours between the window's end and the newest row the source delivered that open the source alert (staleness); 0 turns the limit off" };

    private SourceCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static SourceCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Source;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [MaxFailedRuns, MaxFailingHours, MaxDataAgeHours];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } = [];

    /// <inheritdoc />
    public bool ResolvesOnFirstOkRun => true;

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Source,
        "The model is not being watched: its runs keep failing (the alert text carries the last error), or its source answers but its newest row is older than the staleness limit. Every other check of the model is silent meanwhile.",
        "Read the last error in the alert or in 'modelwatch runs list KEY'; run the model's query by hand against its source; check the source's credentials, reachability and the upstream job that fills it.",
        "Restore the source or fix the query (apply the corrected spec); the alert resolves on the first run that reads its window. Until then treat the model as unmonitored.");

    /// <summary>The state a run continues from: the stored one whatever its baseline (failures are not the baseline's).</summary>
    public static SourceState Recall(CheckState? state) =>
        state is { SchemaVersion: CheckState.CurrentSchemaVersion, Data: not null } s ? s.Read<SourceState>() : new SourceState();

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        SourceState memory = Recall(input.State);
        DateTimeOffset? newest = Later(memory.NewestRowTime, input.NewestRowTime);
        SourceState next = new(0, null, null, newest);
        CheckState state = input.CurrentState.With(next);
        double limit = input.Setting(MaxDataAgeHours);
        var details = new Dictionary<string, double> { ["failed_runs_before"] = memory.ConsecutiveFailures };
        if (newest is { } n)
        {
            double age = Math.Max(0, (input.WindowEnd - n).TotalHours);
            details["data_age_hours"] = age;
            if (limit > 0 && age > limit)
            {
                return Result(state, new Finding
                {
                    Check = Name,
                    Statistic = "data_age_hours",
                    Value = age,
                    Limit = limit,
                    Severity = Severity.Critical,
                    RequiresPersistence = false,
                    Details = details,
                    Explanation = Fmt($"the newest row the source delivered is from {n:yyyy-MM-ddTHH:mm:ssZ}, {Num(age)} h before the window's end (limit {Num(limit)} h): the source answers but stopped filling"),
                });
            }
        }

        string recovered = memory.ConsecutiveFailures > 0 ? Fmt($"; it read its window again after {memory.ConsecutiveFailures} failed run(s)") : string.Empty;
        double maxRuns = input.Setting(MaxFailedRuns);
        return Result(state, new Finding
        {
            Check = Name,
            Statistic = "failed_runs",
            Value = 0,
            Limit = maxRuns,
            Severity = Severity.Ok,
            RequiresPersistence = false,
            Details = details,
            Explanation = Fmt($"the run read its window: 0 failed runs in a row (alert at {maxRuns})") + recovered,
        });
    }

    /// <summary>Evaluates a run that failed before it could read or check its window.</summary>
    /// <param name="modelKey">The model, named in the explanation.</param>
    /// <param name="previous">The stored state of this check, or null.</param>
    /// <param name="fingerprint">The baseline the state belongs to.</param>
    /// <param name="error">Why the run failed.</param>
    /// <param name="startedAt">When the failed run started.</param>
    /// <param name="thresholds">The model's settings.</param>
    public static CheckResult Failed(string modelKey, CheckState? previous, string fingerprint, string error, DateTimeOffset startedAt, CheckThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        SourceState memory = Recall(previous);
        int failures = memory.ConsecutiveFailures + 1;
        DateTimeOffset since = memory.FailingSince ?? startedAt;
        SourceState next = memory with { ConsecutiveFailures = failures, FailingSince = since, LastError = error };
        CheckState state = (previous is { SchemaVersion: CheckState.CurrentSchemaVersion } p ? p with { BaselineFingerprint = fingerprint } : CheckState.For(fingerprint)).With(next);
        int maxRuns = (int)thresholds.Value(MaxFailedRuns);
        double maxHours = thresholds.Value(MaxFailingHours);
        double hours = (startedAt - since).TotalHours;
        bool tooMany = failures >= maxRuns;
        bool tooLong = maxHours > 0 && hours >= maxHours;
        string span = failures == 1 ? "this run failed (1 in a row)" : Fmt($"{failures} runs in a row failed since {since:yyyy-MM-ddTHH:mm:ssZ}");
        string limits = Fmt($"alert at {maxRuns} failed runs") + (maxHours > 0 ? Fmt($" or {Num(maxHours)} h") : string.Empty);
        string verdict = tooMany || tooLong ? "model " + modelKey + " is not being watched (" + limits + ")" : limits;
        return Result(state with { Runs = state.Runs + 1 }, new Finding
        {
            Check = CheckNames.Source,
            Statistic = "failed_runs",
            Value = failures,
            Limit = maxRuns,
            Severity = tooMany || tooLong ? Severity.Critical : Severity.Warning,
            RequiresPersistence = false,
            Details = Details(("failing_hours", hours)),
            Explanation = $"{span}; {verdict}; last error: {error}",
        });
    }

    private static CheckResult Result(CheckState state, Finding finding) =>
        new() { Check = CheckNames.Source, Findings = [finding], State = state };

    private static DateTimeOffset? Later(DateTimeOffset? a, DateTimeOffset? b) => (a, b) switch
    {
        ({ } x, { } y) => x > y ? x : y,
        _ => a ?? b,
    };
}
