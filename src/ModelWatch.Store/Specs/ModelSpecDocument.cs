using System.Text.Json.Serialization;

namespace ModelWatch.Store.Specs;

/// <summary>
/// The fields of a model spec exactly as written (YAML) or stored (jsonb), before validation. Every field is
/// optional here so that one pass can report every problem; <see cref="ModelSpecValidator"/> turns it into a
/// <see cref="ModelSpec"/>.
/// </summary>
internal sealed class ModelSpecDocument
{
    /// <summary>The field names a spec may use, in documentation order.</summary>
    public static readonly IReadOnlyList<string> FieldNames =
    [
        "key", "description", "source", "query", "time_column", "outcome", "features", "intercept", "schedule", "window",
        "min_rows", "missing", "checks", "notify", "label_delay", "prediction_column", "enabled", "parallel_reads",
    ];

    [JsonPropertyName("key")]
    public string? Key { get; set; }

    [JsonPropertyName("description")]
    public string? Description { get; set; }

    [JsonPropertyName("source")]
    public string? Source { get; set; }

    [JsonPropertyName("query")]
    public string? Query { get; set; }

    [JsonPropertyName("time_column")]
    public string? TimeColumn { get; set; }

    [JsonPropertyName("outcome")]
    public string? Outcome { get; set; }

    /// <summary>The outcome's unit for people (axis titles), from <c>outcome: {column: ..., unit: ...}</c>; stored only when set, so older specs keep their hash.</summary>
    [JsonPropertyName("outcome_unit")]
    [JsonIgnore(Condition = JsonIgnoreCondition.WhenWritingNull)]
    public string? OutcomeUnit { get; set; }

    [JsonPropertyName("features")]
    public List<string>? Features { get; set; }

    [JsonPropertyName("intercept")]
    public bool? Intercept { get; set; }

    [JsonPropertyName("schedule")]
    public string? Schedule { get; set; }

    [JsonPropertyName("window")]
    public string? Window { get; set; }

    [JsonPropertyName("min_rows")]
    public int? MinRows { get; set; }

    [JsonPropertyName("missing")]
    public string? Missing { get; set; }

    [JsonPropertyName("checks")]
    public Dictionary<string, Dictionary<string, string>>? Checks { get; set; }

    [JsonPropertyName("notify")]
    public List<string>? Notify { get; set; }

    [JsonPropertyName("label_delay")]
    public string? LabelDelay { get; set; }

    [JsonPropertyName("prediction_column")]
    public string? PredictionColumn { get; set; }

    [JsonPropertyName("enabled")]
    public bool? Enabled { get; set; }

    [JsonPropertyName("parallel_reads")]
    public int? ParallelReads { get; set; }
}
