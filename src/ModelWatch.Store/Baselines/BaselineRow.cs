namespace ModelWatch.Store.Baselines;

/// <summary>A <c>modelwatch.baseline</c> row as Dapper reads it.</summary>
internal sealed class BaselineRow
{
    public string ModelKey { get; set; } = string.Empty;

    public int Version { get; set; }

    public string DesignSignature { get; set; } = string.Empty;

    public DateTime? WindowStart { get; set; }

    public DateTime? WindowEnd { get; set; }

    public DateTime CreatedAt { get; set; }

    public string CreatedBy { get; set; } = string.Empty;

    public string ReferenceJson { get; set; } = string.Empty;

    public StoredBaseline ToStored() => new(
        ModelKey,
        Version,
        DesignSignature,
        Utc(WindowStart),
        Utc(WindowEnd),
        Utc(CreatedAt)!.Value,
        CreatedBy,
        BaselineJson.Deserialize(ReferenceJson));

    private static DateTimeOffset? Utc(DateTime? value) =>
        value is { } v ? new DateTimeOffset(DateTime.SpecifyKind(v, DateTimeKind.Utc), TimeSpan.Zero) : null;
}
