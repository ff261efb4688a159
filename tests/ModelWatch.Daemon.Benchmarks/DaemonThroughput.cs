using System.Diagnostics;
using System.Globalization;
using Dapper;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Testing.Postgres;
using Npgsql;
using OpenTelemetry;
using OpenTelemetry.Metrics;

namespace ModelWatch.Daemon.Benchmarks;

/// <summary>
/// Registers many small models (one shared invented data table, one baseline copied to all), makes every model due,
/// and measures how fast one daemon and then two daemons (each with concurrency 1) run them all once, the per-run
/// overhead beyond reading and fitting (from the stored stage timings), and whether the per-model gauges fit
/// inside the configured metric cardinality limit.
/// </summary>
internal sealed class DaemonThroughput(int models, int rowsPerWindow, TextWriter output)
{
    private static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
    private double _readSeconds;
    private double _fitSeconds;

    public async Task RunAsync()
    {
        PostgresServer server = await PostgresServer.GetAsync();
        string name = "mw_bench_" + Guid.NewGuid().ToString("N")[..8];
        await using (var admin = NpgsqlDataSource.Create(server.ConnectionString))
        {
            await admin.CreateCommand($"CREATE DATABASE {name}").ExecuteNonQueryAsync();
        }

        string connectionString = new NpgsqlConnectionStringBuilder(server.ConnectionString) { Database = name, MaxPoolSize = 50 }.ConnectionString;
        await using var state = NpgsqlDataSource.Create(connectionString);
        var time = new FakeTimeProvider(Start.AddDays(1));
        await SeedAsync(state, connectionString, time);
        output.WriteLine($"models {models}, {rowsPerWindow} rows per window, PostgreSQL from {server.Origin}");

        (double oneSeconds, long oneRuns) = await MeasureAsync(state, connectionString, daemons: 1, round: 1);
        (double twoSeconds, long twoRuns) = await MeasureAsync(state, connectionString, daemons: 2, round: 2);
        await ReportOverheadAsync(state);
        ReportCardinality();

        output.WriteLine();
        output.WriteLine($"| daemons (concurrency 1 each) | runs | seconds | runs/s |");
        output.WriteLine($"|---|---|---|---|");
        output.WriteLine(Row(1, oneRuns, oneSeconds));
        output.WriteLine(Row(2, twoRuns, twoSeconds));
        output.WriteLine($"two daemons / one: {oneSeconds / twoSeconds:F2}× (target ≥ 1.3×)");
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"one daemon: {oneSeconds * 1000 / oneRuns:F2} ms per run end to end, of which reading and fitting {(_readSeconds + _fitSeconds) * 1000:F2} ms: overhead {((oneSeconds / oneRuns) - _readSeconds - _fitSeconds) * 1000:F2} ms per run (target ≤ 10 ms)"));
    }

    private static string Row(int daemons, long runs, double seconds) =>
        string.Create(CultureInfo.InvariantCulture, $"| {daemons} | {runs} | {seconds:F1} | {runs / seconds:F1} |");

    private async Task SeedAsync(NpgsqlDataSource state, string connectionString, TimeProvider time)
    {
        await MigrationRunner.MigrateAsync(state, TimeSpan.FromMinutes(2), CancellationToken.None);
        int rows = 3 * 24 * rowsPerWindow;
        await state.CreateCommand($"""
            CREATE TABLE readings (at timestamptz NOT NULL, x1 float8, x2 float8, x3 float8, y float8);
            INSERT INTO readings
            SELECT timestamptz '2026-01-01Z' + g * (interval '1 hour' / {rowsPerWindow}), a, b, c, 2 + 1.5 * a - b + 0.25 * c + sin(g * 1.9)
            FROM generate_series(0, {rows - 1}) g, LATERAL (SELECT (g * 37 % 101) / 10.0 AS a, (g * 11 % 53) / 5.0 AS b, (g * 7 % 29) AS c) v;
            CREATE INDEX ON readings (at);
            """).ExecuteNonQueryAsync();
        var specs = new List<(ModelSpec, string?)>();
        for (int i = 0; i < models; i++)
        {
            string yaml = $"""
                key: bench-{i:D4}
                query: SELECT at, x1, x2, x3, y FROM readings WHERE at >= @window_start AND at < @window_end
                time_column: at
                outcome: y
                features: [x1, x2, x3]
                schedule: 1h
                window: 1h
                min_rows: 30
                """;
            var problems = new List<SpecProblem>();
            specs.Add((ModelSpecValidator.FromYaml($"bench-{i}.yaml", yaml, problems) ?? throw new ModelSpecException(problems), null));
        }

        await new ModelRepository(state, time, TimeSpan.FromMinutes(2)).ApplyAsync(specs, prune: false, CancellationToken.None);
        await using var databases = new StoreDataSources(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?> { [ConnectionSettings.StateKey] = connectionString }).Build());
        await new BaselineService(databases, time, TimeSpan.FromMinutes(2)).FitAsync("bench-0000", Start, Start.AddDays(1), "bench", CancellationToken.None);
        await using NpgsqlConnection connection = await state.OpenConnectionAsync();
        List<string> names = (await connection.QueryAsync<string>(
            "SELECT column_name FROM information_schema.columns WHERE table_schema = 'modelwatch' AND table_name = 'baseline' AND column_name <> 'model_key' ORDER BY ordinal_position")).ToList();
        await connection.ExecuteAsync(
            $"INSERT INTO modelwatch.baseline (model_key, {string.Join(", ", names)}) SELECT m.key, {string.Join(", ", names.Select(n => "b." + n))} FROM modelwatch.baseline b CROSS JOIN modelwatch.model m WHERE b.model_key = 'bench-0000' AND m.key <> 'bench-0000'",
            commandTimeout: 300);
    }

    private async Task<(double Seconds, long Runs)> MeasureAsync(NpgsqlDataSource state, string connectionString, int daemons, int round)
    {
        // Every model is due at the same slot; the next slot is an hour away, so each model runs exactly once.
        DateTimeOffset slot = Start.AddDays(1).AddHours(round);
        var time = new ShiftedTimeProvider(slot.AddMinutes(1));
        await using (NpgsqlConnection connection = await state.OpenConnectionAsync())
        {
            await connection.ExecuteAsync("UPDATE modelwatch.model SET next_due_slot = @slot, lease_owner = NULL, lease_expires_at = NULL", new { slot });
        }

        var providers = new List<ServiceProvider>();
        var schedulers = new List<SchedulerService>();
        for (int d = 0; d < daemons; d++)
        {
            var services = new ServiceCollection();
            services.AddSingleton<TimeProvider>(time);
            services.AddLogging(b => b.SetMinimumLevel(LogLevel.Warning));
            services.AddModelWatchDaemon(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
            {
                [ConnectionSettings.StateKey] = connectionString,
                ["Daemon:WorkerId"] = $"bench-{round}-{d}",
                ["Daemon:Concurrency"] = "1",
                ["Daemon:MigrateOnStart"] = "false",
            }).Build());
            ServiceProvider provider = services.BuildServiceProvider();
            providers.Add(provider);
            schedulers.Add(provider.GetServices<IHostedService>().OfType<SchedulerService>().Single());
        }

        var clock = Stopwatch.StartNew();
        foreach (SchedulerService scheduler in schedulers)
        {
            await scheduler.StartAsync(CancellationToken.None);
        }

        long runs;
        while ((runs = await CountAsync(state, slot)) < models)
        {
            await Task.Delay(50);
        }

        double seconds = clock.Elapsed.TotalSeconds;
        foreach (SchedulerService scheduler in schedulers)
        {
            await scheduler.StopAsync(CancellationToken.None);
        }

        foreach (ServiceProvider provider in providers)
        {
            await provider.DisposeAsync();
        }

        return (seconds, runs);
    }

    private static async Task<long> CountAsync(NpgsqlDataSource state, DateTimeOffset slot)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync();
        return await connection.ExecuteScalarAsync<long>("SELECT count(*) FROM modelwatch.run WHERE slot = @slot", new { slot });
    }

    private async Task ReportOverheadAsync(NpgsqlDataSource state)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync();
        var row = await connection.QuerySingleAsync<(double Wall, double Read, double Fit, double Checks, string Status)>("""
            SELECT avg(extract(epoch FROM finished_at - started_at)),
                   avg((stage_timings->>'read')::float8), avg((stage_timings->>'fit')::float8), avg((stage_timings->>'checks')::float8),
                   string_agg(DISTINCT status, ',')
              FROM modelwatch.run WHERE worker_id LIKE 'bench-1-%'
            """);
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"one daemon, per run (means, status {row.Status}): wall {row.Wall * 1000:F2} ms = read {row.Read * 1000:F2} + fit {row.Fit * 1000:F2} + checks {row.Checks * 1000:F2} + persist and scheduling {(row.Wall - row.Read - row.Fit - row.Checks) * 1000:F2} ms"));
        (_readSeconds, _fitSeconds) = (row.Read, row.Fit);
        double gap = await connection.QuerySingleAsync<double>("""
            SELECT avg(extract(epoch FROM started_at - previous_finish)) FROM (
              SELECT started_at, lag(finished_at) OVER (ORDER BY started_at) AS previous_finish
                FROM modelwatch.run WHERE worker_id = 'bench-1-0') r
             WHERE previous_finish IS NOT NULL
            """);
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"between runs (claim, model and baseline load, telemetry, loop): {gap * 1000:F2} ms"));
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"inside the run, beyond reading and fitting: {(row.Wall - row.Read - row.Fit) * 1000:F2} ms (checks included)"));
    }

    private void ReportCardinality()
    {
        using ServiceProvider services = new ServiceCollection().AddMetrics().BuildServiceProvider();
        var exported = new List<Metric>();
        const int limit = 20_000;
        using MeterProvider provider = Sdk.CreateMeterProviderBuilder()
            .AddMeter(TelemetryNames.Source)
            .AddView(i => i.Meter.Name == TelemetryNames.Source ? new MetricStreamConfiguration { CardinalityLimit = limit } : null)
            .AddInMemoryExporter(exported)
            .Build();
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>());
        for (int i = 0; i < models; i++)
        {
            metrics.Update($"bench-{i:D4}", new ModelGaugeValues(1.0, 10.0, 1.0, 0.01, 0, 0));
        }

        provider.ForceFlush();
        int points = 0;
        foreach (Metric metric in exported.Where(m => m.Name == TelemetryNames.OpenAlerts))
        {
            foreach (ref readonly MetricPoint point in metric.GetMetricPoints())
            {
                points++;
            }
        }

        output.WriteLine($"gauge {TelemetryNames.OpenAlerts}: {points} series for {models} models (limit {limit}; OpenTelemetry's default of 2,000 would overflow past 999 models)");
    }
}
