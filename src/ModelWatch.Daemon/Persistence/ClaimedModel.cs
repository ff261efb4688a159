namespace ModelWatch.Daemon.Persistence;

/// <summary>A model this worker holds a lease on, and the slot that is due (Npgsql gives timestamptz as UTC DateTime).</summary>
public sealed class ClaimedModel
{
    /// <summary>The model key.</summary>
    public string Key { get; set; } = string.Empty;

    /// <summary>The slot the schedule says is due (UTC).</summary>
    public DateTime DueSlot { get; set; }

    /// <summary>The due slot as an offset time.</summary>
    public DateTimeOffset Slot => new(DateTime.SpecifyKind(DueSlot, DateTimeKind.Utc));
}
