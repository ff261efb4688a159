using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Testing.Postgres;
using Microsoft.Extensions.Configuration;
using Npgsql;

namespace ModelWatch.Store.Tests.Support;

/// <summary>
/// Invented test data: a courier's deliveries, minute by minute from 2026-03-01, with the delivery time in minutes
/// explained by distance, stops and load. Values are deterministic functions of the row number.
/// </summary>
internal static class StoreTestData
{
    public static readonly DateTimeOffset Start = new(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);

    public static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    public static async Task MigrateAsync(PostgresDatabase database) =>
        await MigrationRunner.MigrateAsync(database.DataSource, CommandTimeout, CancellationToken.None);

    /// <summary>Creates <c>deliveries</c> with <paramref name="rows"/> rows, one a minute from <see cref="Start"/>.</summary>
    public static async Task CreateDeliveriesAsync(NpgsqlDataSource source, int rows, string table = "deliveries")
    {
        // xunit makes a class instance per test; the class's database keeps the table from the first one.
        if (await CountAsync(source, $"SELECT count(*) FROM pg_tables WHERE tablename = '{table}'") > 0)
        {
            return;
        }

        await using NpgsqlCommand command = source.CreateCommand($"""
            CREATE TABLE {table} (at timestamptz NOT NULL, distance_km float8, stops int4, load_kg numeric(8,2), minutes float8, served float8, note text, ratio real);
            INSERT INTO {table}
            SELECT timestamptz '2026-03-01 00:00:00+00' + g * interval '1 minute', d, s, l,
                   4 + 2.5 * d + 3 * s + 0.02 * l::float8 + 2 * sin(g * 1.7),
                   4 + 2.5 * d + 3 * s + 0.02 * l::float8, 'ok', (g % 5)::real / 4
            FROM generate_series(0, {rows - 1}) g,
                 LATERAL (SELECT (g % 97) / 7.0 + 1 AS d, (g * 7) % 11 AS s, ((g * 13) % 101 * 3.5)::numeric(8,2) AS l) v;
            """);
        await command.ExecuteNonQueryAsync();
    }

    public static string Yaml(string key, string? query = null, string features = "[distance_km, stops, load_kg]", string extra = "") => $"""
        key: {key}
        description: Courier delivery minutes (invented test data)
        query: |
          {query ?? "SELECT at, distance_km, stops, load_kg, minutes, served, note FROM deliveries WHERE at >= @window_start AND at < @window_end"}
        time_column: at
        outcome: minutes
        features: {features}
        schedule: 1h
        window: 1d
        min_rows: 20
        {extra}
        """;

    public static ModelSpec Spec(string yaml)
    {
        var problems = new List<SpecProblem>();
        return ModelSpecValidator.FromYaml("test.yaml", yaml, problems) ?? throw new ModelSpecException(problems);
    }

    /// <summary>Registers the spec in the state database and returns it.</summary>
    public static async Task<ModelSpec> ApplyAsync(PostgresDatabase database, string yaml)
    {
        ModelSpec spec = Spec(yaml);
        await new ModelRepository(database.DataSource, TimeProvider.System, CommandTimeout).ApplyAsync([(spec, null)], prune: false, CancellationToken.None);
        return spec;
    }

    public static StoreDataSources DataSources(PostgresDatabase database) =>
        new(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?> { [ConnectionSettings.StateKey] = database.ConnectionString }).Build());

    public static async Task<long> CountAsync(NpgsqlDataSource source, string sql)
    {
        await using NpgsqlCommand command = source.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
