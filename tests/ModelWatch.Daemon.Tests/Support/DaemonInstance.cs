using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Scheduling;
using ModelWatch.Store.Configuration;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Support;

/// <summary>One daemon replica in a test: the real service registration with a shared fake clock and captured logs.</summary>
internal sealed class DaemonInstance : IAsyncDisposable
{
    private readonly ServiceProvider _services;
    private readonly SchedulerService _scheduler;

    public DaemonInstance(PostgresDatabase database, TimeProvider time, string workerId, int concurrency = 2, IDictionary<string, string?>? settings = null, Action<IServiceCollection>? configure = null)
        : this(database.ConnectionString, time, workerId, concurrency, settings, configure)
    {
    }

    public DaemonInstance(string connectionString, TimeProvider time, string workerId, int concurrency = 2, IDictionary<string, string?>? settings = null, Action<IServiceCollection>? configure = null)
    {
        var values = new Dictionary<string, string?>
        {
            [ConnectionSettings.StateKey] = connectionString,
            ["Daemon:WorkerId"] = workerId,
            ["Daemon:Concurrency"] = concurrency.ToString(System.Globalization.CultureInfo.InvariantCulture),
            ["Daemon:PollInterval"] = "00:01:00",
            // Longer than the fake clock can race ahead while a run is in flight (StepToAsync nudges it by up to 50 min),
            // so a lease never expires under a running run here; lease expiry is tested with explicit claims.
            ["Daemon:LeaseDuration"] = "06:00:00",
        };
        foreach ((string key, string? value) in settings ?? new Dictionary<string, string?>())
        {
            values[key] = value;
        }

        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(values).Build();
        var services = new ServiceCollection();
        services.AddSingleton(time);
        services.AddLogging(b => b.AddProvider(Logs).SetMinimumLevel(LogLevel.Debug));
        configure?.Invoke(services);
        services.AddModelWatchDaemon(configuration);
        _services = services.BuildServiceProvider();
        _scheduler = _services.GetServices<IHostedService>().OfType<SchedulerService>().Single();
    }

    public CapturedLogs Logs { get; } = new();

    public ModelWatch.Daemon.Health.DaemonHealth Health => _services.GetRequiredService<ModelWatch.Daemon.Health.DaemonHealth>();

    public IServiceProvider Services => _services;

    public Task StartAsync() => _scheduler.StartAsync(CancellationToken.None);

    /// <summary>Starts the notification dispatcher too (most tests need only the scheduler).</summary>
    public Task StartNotificationsAsync() =>
        _services.GetServices<IHostedService>().OfType<ModelWatch.Daemon.Notifications.NotificationDispatcher>().Single().StartAsync(CancellationToken.None);

    /// <summary>Waits (for work, not for a schedule) until the loop has completed a cycle at or after the fake clock's present.</summary>
    public async Task WaitForCycleAsync(TimeProvider time)
    {
        var health = Health;
        DateTimeOffset target = time.GetUtcNow();
        long started = TimeProvider.System.GetTimestamp();
        while (health.LastCycle < target)
        {
            if (TimeProvider.System.GetElapsedTime(started) > TimeSpan.FromSeconds(30))
            {
                throw new TimeoutException($"the scheduler did not complete a cycle at {target:O}");
            }

            // A poll armed just after the clock moved waits for fake time: nudge it on a little (less than a lease).
            if (time is Microsoft.Extensions.Time.Testing.FakeTimeProvider fake && fake.GetUtcNow() < target.AddMinutes(4))
            {
                fake.Advance(TimeSpan.FromSeconds(30));
            }

            await Task.Delay(20);
        }
    }

    public async Task StopAsync()
    {
        using var limit = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        await _scheduler.StopAsync(limit.Token);
    }

    public async ValueTask DisposeAsync()
    {
        await StopAsync();
        await _services.DisposeAsync();
    }
}
