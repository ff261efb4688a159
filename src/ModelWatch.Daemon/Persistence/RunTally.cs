namespace ModelWatch.Daemon.Persistence;

/// <summary>A model's finished runs by status.</summary>
public sealed class RunTally
{
    /// <summary>Runs that ended ok.</summary>
    public int Ok { get; set; }

    /// <summary>Runs that were skipped (too few rows, no baseline).</summary>
    public int Skipped { get; set; }

    /// <summary>Runs that failed.</summary>
    public int Failed { get; set; }

    /// <summary>All finished runs.</summary>
    public int Total => Ok + Skipped + Failed;
}
