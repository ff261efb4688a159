using System.Globalization;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Explain;

/// <summary>
/// Invented data for <c>explain</c>: a ferry's boarding minutes every two minutes from 2026-04-01, explained by the
/// cars and trucks waiting and the wind speed. Six hours into monitoring the minutes per truck double and the wind
/// picks up (an invented new vessel on a stormier season). The real daemon runs hourly on a fake clock, so runs,
/// findings and alerts are what production would have stored.
/// </summary>
internal static class FerryScenario
{
    public const string Key = "ferry-boarding";

    public static readonly DateTimeOffset Start = new(2026, 4, 1, 0, 0, 0, TimeSpan.Zero);

    public static readonly DateTimeOffset ReferenceEnd = Start.AddDays(1);

    private const int MonitoredHours = 14;

    private static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    private const int BreakHour = 24 + 6;

    public static async Task RunAsync(PostgresDatabase database)
    {
        int breakRow = BreakHour * 30;
        await using (NpgsqlCommand create = database.DataSource.CreateCommand($"""
            CREATE TABLE boardings (boarded_at timestamptz NOT NULL, cars int4, trucks int4, wind_ms float8, minutes float8);
            INSERT INTO boardings
            SELECT timestamptz '2026-04-01 00:00:00+00' + g * interval '2 minutes', c, t, w + CASE WHEN g >= {breakRow} THEN 4 ELSE 0 END,
                   6 + 0.4 * c + (CASE WHEN g >= {breakRow} THEN 3.2 ELSE 1.6 END) * t + 0.3 * (w + CASE WHEN g >= {breakRow} THEN 4 ELSE 0 END)
                     + 1.5 * sin(g * 2.3) + cos(g * 0.71)
            FROM generate_series(0, {((24 + MonitoredHours + 1) * 30) - 1}) g,
                 LATERAL (SELECT (g * 37) % 41 AS c, (g * 7) % 9 AS t, ((g * 11) % 53) / 5.0 AS w) v;
            """))
        {
            await create.ExecuteNonQueryAsync();
        }

        // Registered on the fake clock, so the model's first due slot is the end of the reference day.
        var time = new FakeTimeProvider(ReferenceEnd);
        var problems = new List<SpecProblem>();
        ModelSpec spec = ModelSpecValidator.FromYaml(Key + ".yaml", $"""
            key: {Key}
            description: Ferry boarding minutes (invented test data)
            query: SELECT boarded_at, cars, trucks, wind_ms, minutes FROM boardings WHERE boarded_at >= @window_start AND boarded_at < @window_end
            time_column: boarded_at
            outcome:
              column: minutes
              unit: minutes
            features: [cars, trucks, wind_ms]
            schedule: 1h
            window: 2h
            min_rows: 20
            """, problems) ?? throw new ModelSpecException(problems);
        await MigrationRunner.MigrateAsync(database.DataSource, CommandTimeout, CancellationToken.None);
        await new ModelRepository(database.DataSource, time, CommandTimeout).ApplyAsync([(spec, null)], prune: false, CancellationToken.None);
        await using (var databases = new StoreDataSources(Configuration(database)))
        {
            await new BaselineService(databases, time, CommandTimeout).FitAsync(Key, Start, ReferenceEnd, "explain-tests", CancellationToken.None);
        }

        await RunDaemonAsync(database, time);
    }

    public static Task<CliRun> Cli(PostgresDatabase database, params string[] args) =>
        CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);

    public static async Task<long> ScalarAsync(PostgresDatabase database, string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), CultureInfo.InvariantCulture);
    }

    private static IConfiguration Configuration(PostgresDatabase database) => new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
    {
        [ConnectionSettings.StateKey] = database.ConnectionString,
        ["Daemon:WorkerId"] = "explain-tests",
        ["Daemon:PollInterval"] = "00:01:00",
        ["Daemon:LeaseDuration"] = "00:10:00",
    }).Build();

    private static async Task RunDaemonAsync(PostgresDatabase database, FakeTimeProvider time)
    {
        var services = new ServiceCollection();
        services.AddSingleton<TimeProvider>(time);
        services.AddLogging();
        services.AddModelWatchDaemon(Configuration(database));
        await using ServiceProvider provider = services.BuildServiceProvider();
        SchedulerService scheduler = provider.GetServices<IHostedService>().OfType<SchedulerService>().Single();
        await scheduler.StartAsync(CancellationToken.None);
        try
        {
            for (int hour = 1; hour <= MonitoredHours; hour++)
            {
                await StepToAsync(time, ReferenceEnd.AddHours(hour), database, hour);
            }
        }
        finally
        {
            using var limit = new CancellationTokenSource(TimeSpan.FromSeconds(60));
            await scheduler.StopAsync(limit.Token);
        }
    }

    /// <summary>
    /// Moves the fake clock to the target and waits for the daemon's work (not for a schedule) until the model has
    /// <paramref name="runs"/> runs, nudging the clock a minute at a time so a poll armed just after a move still fires.
    /// </summary>
    private static async Task StepToAsync(FakeTimeProvider time, DateTimeOffset target, PostgresDatabase database, long runs)
    {
        if (target > time.GetUtcNow())
        {
            time.SetUtcNow(target);
        }

        long started = TimeProvider.System.GetTimestamp();
        while (await ScalarAsync(database, $"SELECT count(*) FROM modelwatch.run WHERE model_key = '{Key}' AND status <> 'running'") < runs)
        {
            if (TimeProvider.System.GetElapsedTime(started) > TimeSpan.FromSeconds(90))
            {
                throw new TimeoutException($"the daemon did not record run {runs} of {Key} (fake clock at {time.GetUtcNow():O})");
            }

            if (time.GetUtcNow() < target.AddMinutes(50))
            {
                time.Advance(TimeSpan.FromMinutes(1));
            }

            await Task.Delay(20);
        }
    }

}
