using System.Text.Json.Serialization;

namespace ModelWatch.Checks.Summaries;

/// <summary>Where a baseline's coefficients came from.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<BaselineOrigin>))]
public enum BaselineOrigin
{
    /// <summary>Imported from a training pipeline (the reference rows, if any, only complete the statistics).</summary>
    [JsonStringEnumMemberName("imported")]
    Imported,

    /// <summary>Fitted by ModelWatch on a reference window.</summary>
    [JsonStringEnumMemberName("fitted")]
    Fitted,
}
