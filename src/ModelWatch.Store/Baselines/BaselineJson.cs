using System.Text.Json;
using System.Text.Json.Serialization;
using ModelWatch.Checks.Summaries;

namespace ModelWatch.Store.Baselines;

/// <summary>
/// How a <see cref="BaselineReference"/> is stored: snake_case JSON in a jsonb column; NaN and infinities (an
/// aliased VIF, an unknown mean) as the strings "NaN", "Infinity", "-Infinity", which jsonb keeps verbatim.
/// </summary>
public static class BaselineJson
{
    /// <summary>The serializer options of stored baselines.</summary>
    public static readonly JsonSerializerOptions Options = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        WriteIndented = false,
    };

    /// <summary>Serialises a reference.</summary>
    public static string Serialize(BaselineReference reference) => JsonSerializer.Serialize(reference, Options);

    /// <summary>Reads a stored reference back.</summary>
    public static BaselineReference Deserialize(string json) =>
        JsonSerializer.Deserialize<BaselineReference>(json, Options) ?? throw new JsonException("A stored baseline reference is null.");
}
