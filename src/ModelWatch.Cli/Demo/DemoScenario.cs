using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using Npgsql;
using NpgsqlTypes;

namespace ModelWatch.Cli.Demo;

/// <summary>
/// The demo's invented scenario: a city courier's delivery-duration model (route_km, stops, parcel_kg, traffic_index →
/// minutes) watched every 6 hours on a rolling 24-hour window, so each run re-reads the last day and four runs share
/// every row. The first week is clean and becomes the baseline; three incidents follow, each separated by clean days so
/// that their alerts can resolve.
/// </summary>
internal static class DemoScenario
{
    public const string ModelKey = "courier-eta";
    public const string Schema = "courier_demo";
    public const string Table = Schema + ".deliveries";

    public static readonly TimeSpan Cadence = TimeSpan.FromHours(6);

    /// <summary>
    /// End of the data, and the last slot the demo runs: the schedule's current slot when the process started (the
    /// latest 6-hour boundary, at most 6 hours ago). The scenario ends at the present, so a daemon started on a kept
    /// demo database carries on from where the demo stopped, and nothing falls behind the 180-day retention.
    /// </summary>
    public static readonly DateTimeOffset DataEnd = CurrentSlot(TimeProvider.System.GetUtcNow());

    /// <summary>The first delivery, 36 days before the end.</summary>
    public static readonly DateTimeOffset DataStart = DataEnd.AddDays(-36);

    /// <summary>End of the clean reference week, and start of monitoring.</summary>
    public static readonly DateTimeOffset BaselineEnd = DataStart.AddDays(7);

    /// <summary>The rolling window each run reads: four times the cadence.</summary>
    public static readonly TimeSpan Window = TimeSpan.FromHours(24);

    public static readonly DemoIncident CoefficientChange = new(
        1, "coefficient change", "coefficients", DataStart.AddDays(12), DataStart.AddDays(16),
        "road works: each traffic-index point above 50 costs 0.15 min more (and below 50 saves as much)");

    public static readonly DemoIncident Collinearity = new(
        2, "near-collinearity", "collinearity", DataStart.AddDays(21), DataStart.AddDays(25),
        "dispatch plans routes by stop count: stops ≈ route_km / 2");

    public static readonly DemoIncident SensorBias = new(
        3, "sensor bias", "residuals", DataStart.AddDays(30), DataStart.AddDays(33),
        "new handheld scanners log each delivery 4 minutes late");

    public static IReadOnlyList<DemoIncident> Incidents { get; } = [CoefficientChange, Collinearity, SensorBias];

    /// <summary>Runs the daemon makes: one per 6-hour slot after the baseline week, the last one at the end of the data.</summary>
    public static int ExpectedRuns => (int)((DataEnd - BaselineEnd) / Cadence);

    /// <summary>What the data look like at a time: "clean" or the incident under way.</summary>
    public static string PhaseOf(DateTimeOffset time) =>
        Incidents.FirstOrDefault(i => i.Covers(time)) is { } incident ? $"incident {incident.Number}: {incident.Name}" : "clean";

    public static string SpecYaml => $"""
        key: {ModelKey}
        description: Minutes per delivery of an invented city courier (ModelWatch demo data)
        query: |
          SELECT delivered_at, route_km, stops, parcel_kg, traffic_index, minutes
            FROM {Table}
           WHERE delivered_at >= @window_start AND delivered_at < @window_end
        time_column: delivered_at
        outcome: minutes
        features: [route_km, stops, parcel_kg, traffic_index]
        schedule: 6h
        window: 24h
        """;

    /// <summary>Creates the deliveries table (replacing an earlier demo's) and fills it.</summary>
    public static async Task<long> SeedAsync(NpgsqlDataSource database, CancellationToken cancellationToken)
    {
        await using (NpgsqlCommand create = database.CreateCommand($"""
            CREATE SCHEMA IF NOT EXISTS {Schema};
            DROP TABLE IF EXISTS {Table};
            CREATE TABLE {Table} (
                delivered_at  timestamptz NOT NULL,
                route_km      float8 NOT NULL,
                stops         integer NOT NULL,
                parcel_kg     float8 NOT NULL,
                traffic_index float8 NOT NULL,
                minutes       float8 NOT NULL);
            """))
        {
            await create.ExecuteNonQueryAsync(cancellationToken);
        }

        await using NpgsqlConnection connection = await database.OpenConnectionAsync(cancellationToken);
        long rows = 0;
        await using (NpgsqlBinaryImporter copy = await connection.BeginBinaryImportAsync(
            $"COPY {Table} (delivered_at, route_km, stops, parcel_kg, traffic_index, minutes) FROM STDIN (FORMAT BINARY)", cancellationToken))
        {
            foreach (Delivery d in DeliveryGenerator.Generate(DataStart, DataEnd))
            {
                await copy.StartRowAsync(cancellationToken);
                await copy.WriteAsync(d.DeliveredAt, NpgsqlDbType.TimestampTz, cancellationToken);
                await copy.WriteAsync(d.RouteKm, NpgsqlDbType.Double, cancellationToken);
                await copy.WriteAsync(d.Stops, NpgsqlDbType.Integer, cancellationToken);
                await copy.WriteAsync(d.ParcelKg, NpgsqlDbType.Double, cancellationToken);
                await copy.WriteAsync(d.TrafficIndex, NpgsqlDbType.Double, cancellationToken);
                await copy.WriteAsync(d.Minutes, NpgsqlDbType.Double, cancellationToken);
                rows++;
            }

            await copy.CompleteAsync(cancellationToken);
        }

        await using (NpgsqlCommand index = connection.CreateCommand())
        {
            index.CommandText = $"CREATE INDEX ON {Table} (delivered_at); ANALYZE {Table}";
            await index.ExecuteNonQueryAsync(cancellationToken);
        }

        return rows;
    }

    /// <summary>Registers the model and fits its baseline on the clean first week.</summary>
    public static async Task<StoredBaseline> RegisterAsync(StoreDataSources databases, TimeProvider time, string actor, CancellationToken cancellationToken)
    {
        var problems = new List<SpecProblem>();
        ModelSpec spec = ModelSpecValidator.FromYaml(ModelKey + ".yaml", SpecYaml, problems) ?? throw new ModelSpecException(problems);
        await new ModelRepository(databases.State, time, StoreCommandTimeout).ApplyAsync([(spec, null)], prune: false, cancellationToken);
        return await new BaselineService(databases, time, StoreCommandTimeout).FitAsync(ModelKey, DataStart, BaselineEnd, actor, cancellationToken);
    }

    private static TimeSpan StoreCommandTimeout => TimeSpan.FromSeconds(60);

    /// <summary>The 6-hour slot at or before <paramref name="now"/>, as the spec's schedule counts slots (from the Unix epoch).</summary>
    internal static DateTimeOffset CurrentSlot(DateTimeOffset now) =>
        DateTimeOffset.UnixEpoch.AddTicks((now.UtcTicks - DateTimeOffset.UnixEpoch.UtcTicks) / Cadence.Ticks * Cadence.Ticks);
}
