using Npgsql;
using Npgsql.PostgresTypes;

namespace ModelWatch.Store.Windows;

/// <summary>
/// Matches the spec's columns by name against the query's result description (no rows are read) and checks
/// their types. Numeric columns may be float8, float4, smallint, integer, bigint or numeric; everything is
/// read as float8, numeric converted by the server (exact to about 15 significant digits).
/// </summary>
internal static class ColumnCheck
{
    private static readonly HashSet<string> NumericTypes = new(StringComparer.Ordinal) { "float8", "float4", "int2", "int4", "int8", "numeric" };
    private static readonly HashSet<string> TimeTypes = new(StringComparer.Ordinal) { "timestamptz", "timestamp", "date" };

    /// <summary>One problem per missing or mistyped column; empty when the result fits the spec.</summary>
    public static List<(string Column, WindowReadFailure Failure, string Message)> Check(Specs.ModelSpec spec, NpgsqlDataReader described, out HashSet<string> needsCast)
    {
        var cast = new HashSet<string>(StringComparer.Ordinal);
        needsCast = cast;
        var types = new Dictionary<string, string>(StringComparer.Ordinal);
        var duplicates = new HashSet<string>(StringComparer.Ordinal);
        for (int i = 0; i < described.FieldCount; i++)
        {
            string name = described.GetName(i);
            if (!types.TryAdd(name, BaseTypeName(described.GetPostgresType(i))))
            {
                duplicates.Add(name);
            }
        }

        var problems = new List<(string, WindowReadFailure, string)>();
        string available = string.Join(", ", types.Keys);
        void Expect(string role, string column, HashSet<string> allowed, string allowedText)
        {
            if (!types.TryGetValue(column, out string? type))
            {
                problems.Add((column, WindowReadFailure.MissingColumn, $"model {spec.Key}: {role} column '{column}' is not in the query's result (it has: {available})"));
            }
            else if (duplicates.Contains(column))
            {
                problems.Add((column, WindowReadFailure.MissingColumn, $"model {spec.Key}: {role} column '{column}' appears more than once in the query's result; alias one of them"));
            }
            else if (!allowed.Contains(type))
            {
                problems.Add((column, WindowReadFailure.ColumnType, $"model {spec.Key}: {role} column '{column}' has type {type}; it must be {allowedText} (cast it in the query)"));
            }
            else if (allowed == NumericTypes && type != "float8")
            {
                cast.Add(column);
            }
        }

        const string numericText = "float8, float4, smallint, integer, bigint or numeric";
        Expect("time", spec.TimeColumn, TimeTypes, "timestamptz, timestamp or date");
        foreach (string feature in spec.Features)
        {
            Expect("feature", feature, NumericTypes, numericText);
        }

        Expect("outcome", spec.Outcome, NumericTypes, numericText);
        if (spec.PredictionColumn is { } prediction)
        {
            Expect("prediction", prediction, NumericTypes, numericText);
        }

        return problems;
    }

    /// <summary>The read statement: the spec's query as a CTE, the needed columns in design order, ordered by time.</summary>
    public static string ReadSql(Specs.ModelSpec spec, HashSet<string> needsCast)
    {
        IEnumerable<string> columns = spec.Features.Append(spec.Outcome);
        if (spec.PredictionColumn is { } prediction)
        {
            columns = columns.Append(prediction);
        }

        string select = string.Join(", ", columns.Select(c => needsCast.Contains(c) ? $"{Quote(c)}::float8" : Quote(c)));
        // Then whether the previous run already saw the row (sequential statistics consume only new rows), and the row's
        // time in epoch seconds (the newest row's age tells a source that answers but stopped filling).
        string time = Quote(spec.TimeColumn);
        return $"WITH mw_window AS (\n{spec.Query}\n)\nSELECT {select}, ({time} >= @new_from) AS mw_is_new, extract(epoch FROM {time})::float8 AS mw_epoch FROM mw_window ORDER BY {time}";
    }

    private static string Quote(string identifier) => "\"" + identifier.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";

    private static string BaseTypeName(PostgresType type) => type is PostgresDomainType domain ? BaseTypeName(domain.BaseType) : type.InternalName;
}
