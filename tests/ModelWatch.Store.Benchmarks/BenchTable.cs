using System.Globalization;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Store.Benchmarks;

/// <summary>
/// The benchmark's table: <c>obs_N</c> with N rows one second apart from 2026-01-01, ten float8 features drawn
/// uniformly with a fixed seed and an outcome linear in them plus noise. Created once and kept between runs.
/// </summary>
internal static class BenchTable
{
    public static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    public const int Features = 10;

    public static string Name(long rows) => "obs_" + rows.ToString(CultureInfo.InvariantCulture);

    public static async Task EnsureAsync(NpgsqlDataSource source, long rows)
    {
        string table = Name(rows);
        await using (NpgsqlCommand exists = source.CreateCommand($"SELECT count(*) FROM pg_tables WHERE tablename = '{table}'"))
        {
            if ((long)(await exists.ExecuteScalarAsync())! > 0)
            {
                return;
            }
        }

        string xs = string.Join(", ", Enumerable.Range(0, Features).Select(k => $"random() AS x{k}"));
        string y = "1 + " + string.Join(" + ", Enumerable.Range(0, Features).Select(k => $"{k + 1} * x{k}")) + " + (random() - 0.5)";
        string xList = string.Join(", ", Enumerable.Range(0, Features).Select(k => $"x{k}"));
        await using NpgsqlCommand create = source.CreateCommand($"""
            SELECT setseed(0.42);
            CREATE TABLE {table} AS
              SELECT at, {xList}, {y} AS y
              FROM (SELECT timestamptz '2026-01-01 00:00:00+00' + g * interval '1 second' AS at, {xs}
                    FROM generate_series(0, {rows - 1}) g) s;
            CREATE INDEX ON {table} (at);
            ANALYZE {table};
            """);
        create.CommandTimeout = 0;
        await create.ExecuteNonQueryAsync();
    }

    public static ModelSpec Spec(long rows, int parallelReads)
    {
        string xList = string.Join(", ", Enumerable.Range(0, Features).Select(k => $"x{k}"));
        var problems = new List<SpecProblem>();
        string yaml = $"""
            key: bench
            query: SELECT at, {xList}, y FROM {Name(rows)} WHERE at >= @window_start AND at < @window_end
            time_column: at
            outcome: y
            features: [{xList}]
            schedule: 1d
            window: 1d
            parallel_reads: {parallelReads}
            """;
        return ModelSpecValidator.FromYaml("bench.yaml", yaml, problems) ?? throw new ModelSpecException(problems);
    }
}
