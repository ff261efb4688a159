using System.Text.Json.Serialization;

namespace ModelWatch.Checks.Findings;

/// <summary>How serious a finding is. Ordered: a larger value is worse.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<Severity>))]
public enum Severity
{
    /// <summary>Nothing beyond what chance explains, or below the practical floor.</summary>
    [JsonStringEnumMemberName("ok")]
    Ok = 0,

    /// <summary>Worth a look: significant at the warning level, or a practical change without budgeted significance.</summary>
    [JsonStringEnumMemberName("warning")]
    Warning = 1,

    /// <summary>Significant within the false-alarm budget and above the practical floor (or a hard fault).</summary>
    [JsonStringEnumMemberName("critical")]
    Critical = 2,
}
