using System.Text.Json;

namespace ModelWatch.Cli.Output;

/// <summary>Writes doubles so that they round-trip exactly, non-finite values as JSON null, and missing ids or counts as null.</summary>
internal static class JsonNumbers
{
    public static void Write(Utf8JsonWriter writer, string name, double? value)
    {
        writer.WritePropertyName(name);
        Write(writer, value);
    }

    public static void Write(Utf8JsonWriter writer, double? value)
    {
        if (value is { } v && double.IsFinite(v))
        {
            // Utf8JsonWriter prints the shortest string that parses back to the same double.
            writer.WriteNumberValue(v);
        }
        else
        {
            writer.WriteNullValue();
        }
    }

    public static void Write(Utf8JsonWriter writer, string name, long? value)
    {
        if (value is { } v)
        {
            writer.WriteNumber(name, v);
        }
        else
        {
            writer.WriteNull(name);
        }
    }

    /// <summary>
    /// A test's numbers in the documented order and meaning (docs/checks.md, <i>Finding fields</i>): <c>value</c>,
    /// <c>threshold</c>, <c>p_value</c>, <c>alpha</c>, <c>limit</c>; every command that prints a finding writes them here.
    /// </summary>
    public static void WriteTest(Utf8JsonWriter writer, double? value, double? threshold, double? pValue, double? alpha, double? limit)
    {
        Write(writer, "value", value);
        Write(writer, "threshold", threshold);
        Write(writer, "p_value", pValue);
        Write(writer, "alpha", alpha);
        Write(writer, "limit", limit);
    }
}
