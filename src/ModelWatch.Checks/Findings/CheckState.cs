using System.Text.Json;
using System.Text.Json.Serialization;

namespace ModelWatch.Checks.Findings;

/// <summary>
/// The state one check carries from run to run for one model: a plain document the store persists. Its common part
/// (baseline, runs, the end of the last window) belongs to the framework; <see cref="Data"/> is the check's own
/// document, which only that check reads. It is bound to a baseline by fingerprint and to this shape by
/// <see cref="SchemaVersion"/>: a new baseline, or a state written by an older version, starts afresh.
/// </summary>
public sealed record CheckState
{
    /// <summary>The shape this version writes. Version 1 (named fields per statistic) is read as a fresh state.</summary>
    public const int CurrentSchemaVersion = 2;

    private static readonly JsonSerializerOptions DataOptions = new(JsonSerializerDefaults.Web)
    {
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
    };

    /// <summary>Version of this document's shape.</summary>
    public int SchemaVersion { get; init; } = CurrentSchemaVersion;

    /// <summary>Fingerprint of the baseline this state belongs to.</summary>
    public string? BaselineFingerprint { get; init; }

    /// <summary>Runs evaluated since the baseline (or since the state started afresh).</summary>
    public long Runs { get; init; }

    /// <summary>End of the previous run's window (sequential statistics use it to recognise rows already consumed).</summary>
    public DateTimeOffset? LastRunEnd { get; init; }

    /// <summary>The check's own state document; null before its first run.</summary>
    public JsonElement? Data { get; init; }

    /// <summary>A fresh state for a baseline.</summary>
    public static CheckState For(string baselineFingerprint) => new() { BaselineFingerprint = baselineFingerprint };

    /// <summary>The check's document, or a new <typeparamref name="T"/> before the first run.</summary>
    public T Read<T>()
        where T : new() =>
        Data is { ValueKind: JsonValueKind.Object } data ? data.Deserialize<T>(DataOptions) ?? new T() : new T();

    /// <summary>This state with the check's document replaced.</summary>
    public CheckState With<T>(T data) => this with { Data = JsonSerializer.SerializeToElement(data, DataOptions) };
}
