namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The <c>key=value,key=value</c> lists of the OpenTelemetry environment variables (<c>OTEL_RESOURCE_ATTRIBUTES</c>,
/// <c>OTEL_EXPORTER_OTLP_HEADERS</c>): keys and values trimmed, values percent-decoded, entries without a key left out.
/// </summary>
public static class OtelKeyValueList
{
    /// <summary>The pairs of <paramref name="text"/> (null or empty: none); a later key wins.</summary>
    public static Dictionary<string, string> Parse(string? text, IEqualityComparer<string>? comparer = null)
    {
        var pairs = new Dictionary<string, string>(comparer ?? StringComparer.Ordinal);
        foreach (string pair in (text ?? string.Empty).Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            int eq = pair.IndexOf('=', StringComparison.Ordinal);
            if (eq > 0)
            {
                pairs[pair[..eq].Trim()] = Uri.UnescapeDataString(pair[(eq + 1)..].Trim());
            }
        }

        return pairs;
    }
}
