using System.Text.Json;
using System.Text.Json.Serialization;

namespace ModelWatch.Daemon.Persistence;

/// <summary>JSON settings for the state documents the daemon stores (check state, alert policy state, details).</summary>
internal static class StateJson
{
    public static readonly JsonSerializerOptions Options = new(JsonSerializerDefaults.General)
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };
}
