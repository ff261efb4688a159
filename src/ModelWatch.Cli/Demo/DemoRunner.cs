using System.Globalization;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Evidence;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;

namespace ModelWatch.Cli.Demo;

/// <summary>
/// The whole demo: a database, the invented courier data with three planted incidents, the model and its baseline, then
/// the real daemon (the same host <c>modelwatch daemon</c> builds) on an accelerated clock, with progress, every alert
/// transition as it is recorded, a summary of incidents against alerts, and the evidence report of the main alert.
/// </summary>
internal sealed class DemoRunner(TextWriter output, TextWriter error)
{
    /// <summary>Simulated seconds per real second: the 29 monitored days take about 42 s.</summary>
    public const double Speed = 60_000;

    private static readonly TimeSpan PollEvery = TimeSpan.FromMilliseconds(100);

    /// <summary>How long the demo waits for a missing run once the clock has reached the end.</summary>
    private static readonly TimeSpan StallLimit = TimeSpan.FromSeconds(60);

    public async Task<int> RunAsync(string? databaseOption, string? configuredDatabase, bool keep, CancellationToken cancellationToken)
    {
        long began = TimeProvider.System.GetTimestamp();
        output.WriteLine("ModelWatch demo: an invented city courier's delivery-duration model, watched for five weeks in about a minute.");
        await using DemoDatabase database = await DemoDatabase.OpenAsync(databaseOption, configuredDatabase, cancellationToken);
        database.Keep = keep;
        output.WriteLine($"Database: {database.Origin}.");

        var settings = new Dictionary<string, string?> { [ConnectionSettings.StateKey] = database.ConnectionString };
        await using var databases = new StoreDataSources(new ConfigurationBuilder().AddInMemoryCollection(settings).Build());
        await MigrationRunner.MigrateAsync(databases.State, TimeSpan.FromMinutes(2), cancellationToken);
        var progress = new DemoProgress(databases.State);
        await RefuseSharedDatabaseAsync(progress, cancellationToken);

        // The clock stops an hour after the last slot: past a poll interval, so the last slot is claimed, and well
        // before the next slot, which would read a window with no data.
        var clock = new AcceleratedClock(DemoScenario.BaselineEnd.AddMinutes(1), Speed, DemoScenario.DataEnd.AddHours(1));
        long rows = await DemoScenario.SeedAsync(databases.State, cancellationToken);
        output.WriteLine($"Seeded {rows:N0} deliveries in {DemoScenario.Table}, {Stamp(DemoScenario.DataStart)} to {Stamp(DemoScenario.DataEnd)}, the current 6-hour slot (25 an hour).");
        StoredBaseline baseline = await DemoScenario.RegisterAsync(databases, clock, "demo", cancellationToken);
        output.WriteLine($"Registered model {DemoScenario.ModelKey} (every 6 h on a rolling 24 h window: each run re-reads the last day); baseline v{baseline.Version} fitted on the clean week {Stamp(DemoScenario.DataStart)} to {Stamp(DemoScenario.BaselineEnd)}:");
        output.WriteLine("  minutes = " + string.Join(" + ", baseline.Reference.Coefficients.Select(c => c.Key == "(intercept)" ? Number(c.Value) : $"{Number(c.Value)}·{c.Key}")) +
            $"   (residual SD {Number(baseline.Reference.ResidualStandardDeviation)} min)");
        output.WriteLine("Planted incidents (the daemon is not told):");
        foreach (DemoIncident incident in DemoScenario.Incidents)
        {
            output.WriteLine($"  {incident.Number}. {Stamp(incident.Start)} to {Stamp(incident.End)}  {incident.Name}: {incident.Story}");
        }

        output.WriteLine($"Running the daemon on a clock {Speed:N0}× faster than real time, {Day(DemoScenario.BaselineEnd)} to {Day(DemoScenario.DataEnd)} ({DemoScenario.ExpectedRuns} runs):");
        RunTally tally;
        using (IHost host = BuildDaemon(database.ConnectionString, clock))
        {
            // The clock starts once the host is up, so the daemon's start-up costs no simulated hours.
            await host.StartAsync(cancellationToken);
            clock.Run();
            tally = Operations.Terminal.IsTerminal(output)
                ? await LiveDemoView.RunAsync(view => WatchAsync(clock, progress, view, cancellationToken))
                : await WatchAsync(clock, progress, new PlainDemoView(output), cancellationToken);
            await host.StopAsync(cancellationToken);
        }

        var alerts = new AlertRepository(databases.State, TimeSpan.FromSeconds(30));
        IReadOnlyList<AlertView> all = await alerts.ListAsync(DemoScenario.ModelKey, null, 1000, cancellationToken);
        DemoSummary.Write(output, tally, all);
        if (DemoSummary.MainAlert(all) is { } main)
        {
            // Under the temporary folder, not the working one: the README runs the demo from a git checkout.
            string folder = Directory.CreateDirectory(Path.Combine(Path.GetTempPath(), "modelwatch-demo")).FullName;
            string path = await EvidenceReport.WriteAlertAsync(databases, main.Id, Path.Combine(folder, $"{DemoScenario.ModelKey}-alert-{main.Id}.html"), cancellationToken);
            output.WriteLine($"Evidence report for alert #{main.Id} ({main.Check}{(main.Subject is null ? string.Empty : "/" + main.Subject)}): {path}");
            output.WriteLine($"  In the terminal: modelwatch explain {main.Id.ToString(CultureInfo.InvariantCulture)}{KeepHint(keep, database)}");
        }

        if (keep && database.Cluster is { } cluster)
        {
            string state = KeptDemoDatabases.Remember(cluster);
            output.WriteLine($"The database is left running: {database.ConnectionString}");
            output.WriteLine($"  e.g. modelwatch alerts list {DemoScenario.ModelKey} --state all --database \"{database.ConnectionString}\"");
            output.WriteLine($"  Its data end at the current slot ({Stamp(DemoScenario.DataEnd)}): a live daemon carries on from there, ConnectionStrings__State=\"{database.ConnectionString}\" modelwatch daemon");
            output.WriteLine($"  Stop it and remove its files (in {cluster.Root}) with: modelwatch demo --stop   (recorded in {state})");
        }
        else if (database.Started)
        {
            output.WriteLine("The throwaway database is stopped and removed (use --keep to leave it running).");
        }

        output.WriteLine($"Demo finished in {TimeProvider.System.GetElapsedTime(began).TotalSeconds.ToString("F1", CultureInfo.InvariantCulture)} s.");
        return ExitCodes.Ok;
    }

    // A connection string the user gave may hold a password: it is not echoed back.
    private static string KeepHint(bool keep, DemoDatabase database) =>
        !database.Started ? " --database <the same connection string>"
        : keep ? $" --database \"{database.ConnectionString}\""
        : " (with --keep, while the database is up)";

    private static async Task RefuseSharedDatabaseAsync(DemoProgress progress, CancellationToken cancellationToken)
    {
        IReadOnlyList<string> others = await progress.OtherModelsAsync(cancellationToken);
        if (others.Count > 0)
        {
            // The daemon would run those models too, on the demo's clock, and record runs weeks away from now.
            throw new DemoException($"the database already watches other models ({string.Join(", ", others)}); run the demo on an empty database or without --database");
        }

        if (await progress.HasEarlierRunsAsync(cancellationToken))
        {
            throw new DemoException($"the database already holds an earlier demo's runs of {DemoScenario.ModelKey}; run the demo on a fresh database or without --database");
        }
    }

    private IHost BuildDaemon(string connectionString, AcceleratedClock clock)
    {
        // Simulated durations: a 30 min poll is 30 ms of real time; the lease outlasts any run; no slot is passed over.
        var daemonSettings = new Dictionary<string, string?>
        {
            ["Daemon:WorkerId"] = "demo",
            ["Daemon:Concurrency"] = "1",
            ["Daemon:PollInterval"] = "00:30:00",
            ["Daemon:LeaseDuration"] = "1.00:00:00",
            ["Daemon:MigrateOnStart"] = "false",
            ["Daemon:MissedSlots"] = "CatchUp",
            ["Daemon:MaxCatchUpSlots"] = "10000",
            ["Daemon:ShutdownTimeout"] = "00:10:00",
            ["Retention:Interval"] = "7.00:00:00",
            ["Http:Enabled"] = "false",
            ["Telemetry:PrometheusEnabled"] = "false",
            ["Specs:Directory"] = string.Empty,
        };
        return DaemonHost.Build(
            [],
            connectionString,
            configuration => configuration.AddInMemoryCollection(daemonSettings),
            services =>
            {
                services.AddSingleton<TimeProvider>(clock);
                services.RemoveAll<ILoggerFactory>();
                services.AddSingleton<ILoggerFactory>(_ => LoggerFactory.Create(b => b.SetMinimumLevel(LogLevel.Warning).AddProvider(new DemoLoggerProvider(error))));
            });
    }

    private async Task<RunTally> WatchAsync(AcceleratedClock clock, DemoProgress progress, IDemoView view, CancellationToken cancellationToken)
    {
        long lastEvent = 0;
        long? stoppedSince = null;
        int lastTotal = -1;
        while (true)
        {
            await Task.Delay(PollEvery, cancellationToken);
            RunTally tally = await progress.RunsAsync(cancellationToken);
            foreach (ModelAlertEvent transition in await progress.TransitionsAfterAsync(lastEvent, cancellationToken))
            {
                lastEvent = transition.EventId;
                view.Transition(transition);
            }

            DateTimeOffset now = clock.GetUtcNow();
            view.Tick(now, tally);

            if (tally.Total >= DemoScenario.ExpectedRuns)
            {
                return tally;
            }

            if (now >= clock.StopAt)
            {
                stoppedSince ??= TimeProvider.System.GetTimestamp();
                if (tally.Total != lastTotal)
                {
                    stoppedSince = TimeProvider.System.GetTimestamp();
                }

                if (TimeProvider.System.GetElapsedTime(stoppedSince.Value) > StallLimit)
                {
                    error.WriteLine($"modelwatch demo: the daemon recorded {tally.Total} of {DemoScenario.ExpectedRuns} runs and made no progress for {StallLimit.TotalSeconds:F0} s; stopping");
                    return tally;
                }
            }

            lastTotal = tally.Total;
        }
    }

    internal static string Day(DateTimeOffset time) => time.UtcDateTime.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture);

    internal static string Stamp(DateTimeOffset time) => time.UtcDateTime.ToString("yyyy-MM-dd HH:mm'Z'", CultureInfo.InvariantCulture);

    internal static string Number(double value) => value.ToString("0.###", CultureInfo.InvariantCulture);
}
