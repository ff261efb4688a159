using System.Globalization;
using Microsoft.Extensions.Configuration;
using ModelWatch.Cli.Demo;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Demo;

/// <summary>The demo's seeded data on a real PostgreSQL: each planted incident moves what it should, and only that.</summary>
public sealed class DemoScenarioTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private StoredBaseline? _baseline;

    public async Task InitializeAsync()
    {
        await MigrationRunner.MigrateAsync(database.DataSource, TimeSpan.FromMinutes(1), CancellationToken.None);
        Assert.Equal(36 * 600, await DemoScenario.SeedAsync(database.DataSource, CancellationToken.None));
        await using StoreDataSources databases = Sources();
        _baseline = await DemoScenario.RegisterAsync(databases, TimeProvider.System, "test", CancellationToken.None);
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public void The_baseline_week_recovers_the_planted_relationship()
    {
        IReadOnlyDictionary<string, double> b = _baseline!.Reference.Coefficients;

        // Planted: 6 + 2.2 km + 4 stops + 0.15 kg + 0.35 traffic, noise SD 5; 4,200 rows give standard errors of
        // about 0.01 for the slopes, so these bounds are several of them wide.
        Assert.InRange(b["route_km"], 2.15, 2.25);
        Assert.InRange(b["stops"], 3.9, 4.1);
        Assert.InRange(b["parcel_kg"], 0.12, 0.18);
        Assert.InRange(b["traffic_index"], 0.33, 0.37);
        Assert.InRange(_baseline.Reference.ResidualStandardDeviation, 4.7, 5.3);
    }

    [Fact]
    public async Task A_refit_of_the_coefficient_incident_shows_the_planted_traffic_surcharge()
    {
        DemoIncident incident = DemoScenario.CoefficientChange;
        StoredBaseline during = await Fit(incident.Start, incident.End);
        StoredBaseline after = await Fit(incident.End, DemoScenario.Collinearity.Start);

        double moved = during.Reference.Coefficients["traffic_index"] - _baseline!.Reference.Coefficients["traffic_index"];
        Assert.InRange(moved, 0.13, 0.17);
        Assert.InRange(Math.Abs(during.Reference.Coefficients["route_km"] - _baseline.Reference.Coefficients["route_km"]), 0, 0.05);
        Assert.InRange(Math.Abs(after.Reference.Coefficients["traffic_index"] - _baseline.Reference.Coefficients["traffic_index"]), 0, 0.02);
    }

    [Fact]
    public async Task The_collinearity_incident_ties_stops_to_route_length_without_changing_their_spread()
    {
        DemoIncident incident = DemoScenario.Collinearity;

        double during = await Scalar($"SELECT corr(route_km, stops) FROM {DemoScenario.Table} WHERE delivered_at >= @from AND delivered_at < @to", incident.Start, incident.End);
        double before = await Scalar($"SELECT corr(route_km, stops) FROM {DemoScenario.Table} WHERE delivered_at >= @from AND delivered_at < @to", DemoScenario.DataStart, DemoScenario.BaselineEnd);
        double spreadDuring = await Scalar($"SELECT stddev(stops) FROM {DemoScenario.Table} WHERE delivered_at >= @from AND delivered_at < @to", incident.Start, incident.End);
        double spreadBefore = await Scalar($"SELECT stddev(stops) FROM {DemoScenario.Table} WHERE delivered_at >= @from AND delivered_at < @to", DemoScenario.DataStart, DemoScenario.BaselineEnd);

        Assert.InRange(during, 0.97, 1.0);
        Assert.InRange(before, -0.05, 0.05);
        Assert.InRange(spreadDuring / spreadBefore, 0.9, 1.1);
        StoredBaseline fit = await Fit(incident.Start, incident.End);
        Assert.InRange(fit.Reference.Coefficients["traffic_index"] - _baseline!.Reference.Coefficients["traffic_index"], -0.02, 0.02);
    }

    [Fact]
    public async Task The_sensor_incident_adds_the_planted_bias_to_the_baseline_predictions_errors()
    {
        IReadOnlyDictionary<string, double> b = _baseline!.Reference.Coefficients;
        string error = string.Create(CultureInfo.InvariantCulture,
            $"minutes - ({b["(intercept)"]} + {b["route_km"]} * route_km + {b["stops"]} * stops + {b["parcel_kg"]} * parcel_kg + {b["traffic_index"]} * traffic_index)");
        string sql = $"SELECT avg({error}) FROM {DemoScenario.Table} WHERE delivered_at >= @from AND delivered_at < @to";

        double during = await Scalar(sql, DemoScenario.SensorBias.Start, DemoScenario.SensorBias.End);
        double before = await Scalar(sql, DemoScenario.Collinearity.End, DemoScenario.SensorBias.Start);

        // 1,800 rows with noise SD 5: the mean error's standard error is 0.12.
        Assert.InRange(during - before, 4.0 - 0.6, 4.0 + 0.6);
        Assert.InRange(before, -0.6, 0.6);
    }

    [Fact]
    public void The_incidents_lie_after_the_baseline_week_in_order_with_clean_days_between_them()
    {
        DateTimeOffset cleanFrom = DemoScenario.BaselineEnd;
        foreach (DemoIncident incident in DemoScenario.Incidents)
        {
            Assert.True(incident.Start - cleanFrom >= TimeSpan.FromDays(3), $"incident {incident.Number} follows clean days");
            cleanFrom = incident.End;
        }

        Assert.True(DemoScenario.DataEnd - cleanFrom >= TimeSpan.FromDays(3));
        Assert.Equal(116, DemoScenario.ExpectedRuns);
    }

    private async Task<StoredBaseline> Fit(DateTimeOffset from, DateTimeOffset to)
    {
        await using StoreDataSources databases = Sources();
        return await new BaselineService(databases, TimeProvider.System, TimeSpan.FromSeconds(60)).FitAsync(DemoScenario.ModelKey, from, to, "test", CancellationToken.None);
    }

    private StoreDataSources Sources() => new(new ConfigurationBuilder()
        .AddInMemoryCollection(new Dictionary<string, string?> { [ConnectionSettings.StateKey] = database.ConnectionString })
        .Build());

    private async Task<double> Scalar(string sql, DateTimeOffset from, DateTimeOffset to)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        command.Parameters.AddWithValue("from", from);
        command.Parameters.AddWithValue("to", to);
        return Convert.ToDouble(await command.ExecuteScalarAsync(), CultureInfo.InvariantCulture);
    }
}
