using System.Diagnostics;
using System.Globalization;
using Dapper;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Runs;
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

        // Each daemon set runs every model twice: a cold pass just after start (per-model caches empty; the first set
        // also pays the process's JIT and one-off threshold solving) and a warm pass an hour later, the steady state.
        (Pass oneCold, Pass oneWarm) = await MeasureAsync(state, connectionString, daemons: 1, round: 1);
        (Pass twoCold, Pass twoWarm) = await MeasureAsync(state, connectionString, daemons: 2, round: 2);
        await ReportOverheadAsync(state, "one daemon, cold pass", oneCold);
        Pass warm = await ReportOverheadAsync(state, "one daemon, warm pass", oneWarm);
        ReportCardinality();

        output.WriteLine();
        output.WriteLine($"| daemons (concurrency 1 each) | pass | runs | seconds | runs/s |");
        output.WriteLine($"|---|---|---|---|---|");
        output.WriteLine(Row(1, "cold", oneCold));
        output.WriteLine(Row(1, "warm", oneWarm));
        output.WriteLine(Row(2, "cold", twoCold));
        output.WriteLine(Row(2, "warm", twoWarm));
        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"two daemons / one: {oneWarm.Seconds / twoWarm.Seconds:F2}× warm, {oneCold.Seconds / twoCold.Seconds:F2}× cold (target ≥ 1.3×)"));
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"one daemon, warm: {warm.Seconds * 1000 / warm.Runs:F2} ms per run end to end, of which reading and fitting {(warm.ReadSeconds + warm.FitSeconds) * 1000:F2} ms: overhead {((warm.Seconds / warm.Runs) - warm.ReadSeconds - warm.FitSeconds) * 1000:F2} ms per run (target ≤ 10 ms)"));
    }

    private static string Row(int daemons, string pass, Pass measured) =>
        string.Create(CultureInfo.InvariantCulture, $"| {daemons} | {pass} | {measured.Runs} | {measured.Seconds:F1} | {measured.Runs / measured.Seconds:F1} |");

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

    private async Task<(Pass Cold, Pass Warm)> MeasureAsync(NpgsqlDataSource state, string connectionString, int daemons, int round)
    {
        // Every model is due at the same slot; the next slot is an hour away, so each pass runs each model exactly once.
        DateTimeOffset coldSlot = Start.AddDays(1).AddHours(2 * round);
        DateTimeOffset warmSlot = coldSlot.AddHours(1);
        var time = new ShiftedTimeProvider(coldSlot.AddMinutes(1));
        await using (NpgsqlConnection connection = await state.OpenConnectionAsync())
        {
            await connection.ExecuteAsync("UPDATE modelwatch.model SET next_due_slot = @coldSlot, lease_owner = NULL, lease_expires_at = NULL", new { coldSlot });
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
                ["Daemon:PollInterval"] = "00:00:01",
            }).Build());
            ServiceProvider provider = services.BuildServiceProvider();
            providers.Add(provider);
            schedulers.Add(provider.GetServices<IHostedService>().OfType<SchedulerService>().Single());
        }

        foreach (SchedulerService scheduler in schedulers)
        {
            await scheduler.StartAsync(CancellationToken.None);
        }

        Pass cold = await AwaitPassAsync(state, coldSlot);
        time.JumpTo(warmSlot.AddMinutes(1));
        Pass warm = await AwaitPassAsync(state, warmSlot);
        foreach (SchedulerService scheduler in schedulers)
        {
            await scheduler.StopAsync(CancellationToken.None);
        }

        foreach (ServiceProvider provider in providers)
        {
            await provider.DisposeAsync();
        }

        return (cold, warm);
    }

    /// <summary>Waits until every model has run at the slot; the pass lasts from its first run's start to its last run's end.</summary>
    private async Task<Pass> AwaitPassAsync(NpgsqlDataSource state, DateTimeOffset slot)
    {
        while (true)
        {
            await using NpgsqlConnection connection = await state.OpenConnectionAsync();
            var row = await connection.QuerySingleAsync<(long Runs, double Seconds)>(
                "SELECT count(*), coalesce(extract(epoch FROM max(finished_at) - min(started_at))::float8, 0) FROM modelwatch.run WHERE slot = @slot", new { slot });
            if (row.Runs >= models)
            {
                return new Pass(slot, row.Runs, row.Seconds, 0, 0);
            }

            await Task.Delay(50);
        }
    }

    private async Task<Pass> ReportOverheadAsync(NpgsqlDataSource state, string label, Pass pass)
    {
        await using NpgsqlConnection connection = await state.OpenConnectionAsync();
        var row = await connection.QuerySingleAsync<(double Wall, double Read, double Fit, double Checks, string Status)>("""
            SELECT avg(extract(epoch FROM finished_at - started_at)),
                   avg((stage_timings->>'read')::float8), avg((stage_timings->>'fit')::float8), avg((stage_timings->>'checks')::float8),
                   string_agg(DISTINCT status, ',')
              FROM modelwatch.run WHERE slot = @slot
            """, new { slot = pass.Slot });
        double gap = await connection.QuerySingleAsync<double>("""
            SELECT avg(extract(epoch FROM started_at - previous_finish)) FROM (
              SELECT started_at, lag(finished_at) OVER (ORDER BY started_at) AS previous_finish
                FROM modelwatch.run WHERE slot = @slot) r
             WHERE previous_finish IS NOT NULL
            """, new { slot = pass.Slot });
        output.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"{label}, per run (means, status {row.Status}): inside the run {row.Wall * 1000:F2} ms = read {row.Read * 1000:F2} + fit {row.Fit * 1000:F2} + checks {row.Checks * 1000:F2} + the rest {(row.Wall - row.Read - row.Fit - row.Checks) * 1000:F2} ms; between runs (record, claim, model and baseline load, telemetry) {gap * 1000:F2} ms"));
        return pass with { ReadSeconds = row.Read, FitSeconds = row.Fit };
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
        var metrics = new ModelWatchMetrics(services.GetRequiredService<System.Diagnostics.Metrics.IMeterFactory>(), TimeProvider.System);
        for (int i = 0; i < models; i++)
        {
            metrics.Update($"bench-{i:D4}", new ModelGaugeValues(new RunMeasurements(1.0, 10.0, 1.0, 0.01), 0, 0, false, 0, TimeProvider.System.GetUtcNow(), TimeProvider.System.GetUtcNow(), TimeSpan.FromHours(1)));
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

    /// <summary>One pass over every model at one slot, with the mean read and fit stage times once reported.</summary>
    private sealed record Pass(DateTimeOffset Slot, long Runs, double Seconds, double ReadSeconds, double FitSeconds);
}
