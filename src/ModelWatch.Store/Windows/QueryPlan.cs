using System.Text.Json;
using Npgsql;
using NpgsqlTypes;

namespace ModelWatch.Store.Windows;

/// <summary>
/// The tables and views' underlying tables a query reads, from the server's plan (<c>EXPLAIN (VERBOSE, FORMAT JSON)</c>:
/// planned, never run; views are expanded in it). The window parameters are bound, since the plan needs values.
/// </summary>
internal static class QueryPlan
{
    /// <summary>Every (schema, relation) a scan of the plan reads, each once, in plan order.</summary>
    public static async Task<IReadOnlyList<(string Schema, string Relation)>> RelationsAsync(
        NpgsqlConnection connection, NpgsqlTransaction? transaction, string query, DateTimeOffset start, DateTimeOffset end, int commandTimeoutSeconds, CancellationToken cancellationToken)
    {
        await using var explain = new NpgsqlCommand("EXPLAIN (VERBOSE, FORMAT JSON) " + query, connection, transaction) { CommandTimeout = commandTimeoutSeconds };
        explain.Parameters.Add(new NpgsqlParameter("window_start", NpgsqlDbType.TimestampTz) { Value = start.UtcDateTime });
        explain.Parameters.Add(new NpgsqlParameter("window_end", NpgsqlDbType.TimestampTz) { Value = end.UtcDateTime });
        using JsonDocument plan = JsonDocument.Parse((string)(await explain.ExecuteScalarAsync(cancellationToken))!);
        var found = new List<(string, string)>();
        Collect(plan.RootElement, found);
        return [.. found.Distinct()];
    }

    private static void Collect(JsonElement element, List<(string, string)> found)
    {
        if (element.ValueKind == JsonValueKind.Object)
        {
            if (element.TryGetProperty("Schema", out JsonElement schema) && element.TryGetProperty("Relation Name", out JsonElement name))
            {
                found.Add((schema.GetString()!, name.GetString()!));
            }

            foreach (JsonProperty property in element.EnumerateObject())
            {
                Collect(property.Value, found);
            }
        }
        else if (element.ValueKind == JsonValueKind.Array)
        {
            foreach (JsonElement item in element.EnumerateArray())
            {
                Collect(item, found);
            }
        }
    }
}
