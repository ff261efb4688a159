namespace ModelWatch.Daemon.Options;

/// <summary>What happens to schedule slots that passed while no replica was running.</summary>
public enum MissedSlotPolicy
{
    /// <summary>Run only the most recent missed slot; older ones are passed over, and the log names them.</summary>
    LatestOnly,

    /// <summary>Run every missed slot, oldest first, up to <see cref="DaemonOptions.MaxCatchUpSlots"/>.</summary>
    CatchUp,
}
