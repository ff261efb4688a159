using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// A check: a pure function from a baseline, a window's summary, the check's own state and the model's settings to
/// findings and the state for next time. Each check owns its name, its settings, the budget channels it spends, its
/// sequential state (a document only it reads) and its runbook entry; <see cref="CheckRegistry"/> lists them, and
/// the run, the spec validation, the budget and the runbook all iterate over that list.
/// </summary>
public interface IModelCheck
{
    /// <summary>The check's name, as stored and reported.</summary>
    string Name { get; }

    /// <summary>The settings a spec may override under <c>checks: { NAME: … }</c>.</summary>
    IReadOnlyList<CheckSetting> Settings { get; }

    /// <summary>The shares of the false-alarm budget the check's paging tests spend (none for hard faults only).</summary>
    IReadOnlyList<AlarmChannel> Channels { get; }

    /// <summary>What an alert of this check means, how to confirm it and what to do.</summary>
    RunbookEntry Runbook { get; }

    /// <summary>
    /// True when an open alert of this check resolves on the first run with nothing above ok (a fault clears when the
    /// fault does), rather than after the model's <c>resolve_after_ok_windows</c>.
    /// </summary>
    bool ResolvesOnFirstOkRun => false;

    /// <summary>Runs the check on one window.</summary>
    CheckResult Run(CheckInput input);
}
