namespace ModelWatch.Daemon.Alerts;

/// <summary>What an operator's acknowledge or resolve did.</summary>
public enum AlertChangeKind
{
    /// <summary>The alert moved to the asked state.</summary>
    Changed,

    /// <summary>Nothing to do: the alert is already in that state (or past it); the message says by whom and when.</summary>
    AlreadyDone,

    /// <summary>No alert has that number.</summary>
    NotFound,
}
