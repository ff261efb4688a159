using ModelWatch.Store.Specs;

namespace ModelWatch.Store.Models;

/// <summary>A <c>modelwatch.model</c> row as Dapper reads it (settable properties; Npgsql gives timestamptz as UTC DateTime).</summary>
internal sealed class ModelRow
{
    public string Key { get; set; } = string.Empty;

    public string SpecJson { get; set; } = string.Empty;

    public bool Enabled { get; set; }

    public DateTime? NextDueSlot { get; set; }

    public string? LeaseOwner { get; set; }

    public DateTime? LeaseExpiresAt { get; set; }

    public string? SourceFile { get; set; }

    public DateTime CreatedAt { get; set; }

    public DateTime UpdatedAt { get; set; }

    public int? BaselineVersion { get; set; }

    public string? BaselineDesignSignature { get; set; }

    public ModelRecord ToRecord() => new(
        ModelSpecValidator.FromStoredJson(SpecJson),
        Enabled,
        Utc(NextDueSlot),
        LeaseOwner,
        Utc(LeaseExpiresAt),
        SourceFile,
        Utc(CreatedAt)!.Value,
        Utc(UpdatedAt)!.Value,
        BaselineVersion,
        BaselineDesignSignature);

    private static DateTimeOffset? Utc(DateTime? value) =>
        value is { } v ? new DateTimeOffset(DateTime.SpecifyKind(v, DateTimeKind.Utc), TimeSpan.Zero) : null;
}
