namespace ModelWatch.Daemon.Evidence;

/// <summary>A recorded run of the model with its findings.</summary>
internal sealed record EvidenceRun(
    long Id,
    DateTimeOffset Slot,
    DateTimeOffset? WindowStart,
    DateTimeOffset? WindowEnd,
    string Status,
    string? Reason,
    int? BaselineVersion,
    long RowsRead,
    IReadOnlyList<EvidenceFinding> Findings)
{
    /// <summary>Where the run sits on a time axis: its window end, or its slot.</summary>
    public DateTimeOffset At => WindowEnd ?? Slot;

    /// <summary>The first finding of a check and statistic (and subject, when given) that was not skipped.</summary>
    public EvidenceFinding? Find(string check, string statistic, string? subject = null) =>
        Findings.FirstOrDefault(f => f.Check == check && f.Statistic == statistic && f.Skipped is null && (subject is null || f.Subject == subject));
}
