using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Daemon.Evidence;

/// <summary>Everything <c>explain</c> shows about one alert or run: the model's recent history around it.</summary>
internal sealed record Evidence
{
    /// <summary>The id asked about: an alert id when <see cref="Alert"/> is set, otherwise a run id.</summary>
    public required long Id { get; init; }

    /// <summary>The model.</summary>
    public required string Model { get; init; }

    /// <summary>The alert, when the id names one.</summary>
    public AlertView? Alert { get; init; }

    /// <summary>The resolved alert of the same condition that this one follows, when it came back.</summary>
    public long? PreviousAlertId { get; init; }

    /// <summary>The outcome column and its unit from the model's spec (unit null when the spec names none).</summary>
    public (string Column, string? Unit)? Outcome { get; init; }

    /// <summary>The alert's transitions, oldest first (empty for a run).</summary>
    public IReadOnlyList<AlertHistoryEntry> History { get; init; } = [];

    /// <summary>The run the evidence comes from (the run asked about, or the alert's latest run); null when pruned.</summary>
    public EvidenceRun? Focus { get; init; }

    /// <summary>The model's runs, oldest first.</summary>
    public required IReadOnlyList<EvidenceRun> Runs { get; init; }

    /// <summary>The baseline the focus run was compared with (or the current one).</summary>
    public StoredBaseline? Baseline { get; init; }

    /// <summary>Standardized errors of the deployed coefficients on the focus window, re-read from the data source.</summary>
    public IReadOnlyList<double> WindowResiduals { get; init; } = [];

    /// <summary>Why <see cref="WindowResiduals"/> is empty, when it is.</summary>
    public string? WindowResidualsProblem { get; init; }

    /// <summary>The latest run at or before the focus with a finding of this check and statistic that ran.</summary>
    public (EvidenceRun Run, EvidenceFinding Finding)? Latest(string check, string statistic)
    {
        foreach (EvidenceRun run in Runs.Reverse().SkipWhile(r => Focus is not null && r.Slot > Focus.Slot))
        {
            if (run.Find(check, statistic) is { } finding)
            {
                return (run, finding);
            }
        }

        return null;
    }
}
