using System.Text.Json.Serialization;

namespace ModelWatch.Checks.Policy;

/// <summary>What the alert policy decided for one (check, subject) after a run.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<AlertAction>))]
public enum AlertAction
{
    /// <summary>Nothing changes.</summary>
    [JsonStringEnumMemberName("none")]
    None,

    /// <summary>Open a new alert (critical, or warning when warning alerts are on; see <see cref="AlertDecision.AlertSeverity"/>).</summary>
    [JsonStringEnumMemberName("open")]
    Open,

    /// <summary>An alert is already open and this run adds fresh critical evidence: a critical decision escalates a warning alert.</summary>
    [JsonStringEnumMemberName("raise")]
    Raise,

    /// <summary>The open alert has been quiet long enough (hysteresis): resolve it.</summary>
    [JsonStringEnumMemberName("resolve")]
    Resolve,
}
