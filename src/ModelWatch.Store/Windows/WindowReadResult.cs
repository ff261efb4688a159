namespace ModelWatch.Store.Windows;

/// <summary>What a window read produced: the filled sink and the row counts, with rejected rows counted by reason.</summary>
public sealed record WindowReadResult<TSink>(
    TSink Sink,
    DateTimeOffset WindowStart,
    DateTimeOffset WindowEnd,
    long RowsRead,
    long RowsRejected,
    IReadOnlyDictionary<string, long> RejectedReasons)
{
    /// <summary>The time of the newest row read (rejected rows included), or null when the window had none.</summary>
    public DateTimeOffset? NewestRowTime { get; init; }

    /// <summary>Rows that reached the sink.</summary>
    public long RowsAccepted => RowsRead - RowsRejected;
}
