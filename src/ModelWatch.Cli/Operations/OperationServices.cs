using System.CommandLine;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using ModelWatch.Cli.Commands;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using Npgsql;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// The daemon's own parts, resolved from the daemon's own registrations so they are built exactly as a replica
/// builds them: the <see cref="RunPipeline"/> the scheduler runs, the <see cref="RunRecorder"/> that reads and
/// writes run memory, leases and the model registry. No hosted service is started and no telemetry is exported.
/// </summary>
internal sealed class OperationServices : IAsyncDisposable
{
    private readonly ServiceProvider _provider;

    public OperationServices(StoreDataSources databases, TimeProvider time)
    {
        ArgumentNullException.ThrowIfNull(databases);
        var services = new ServiceCollection();
        // Registered first, so the daemon's TryAdd registrations use the command's open databases and clock.
        services.AddSingleton(databases);
        services.AddSingleton(databases.State);
        services.AddSingleton(time);
        services.AddLogging();
        services.AddModelWatchDaemon(ConnectionSettings.Load());
        _provider = services.BuildServiceProvider();
        Time = time;
        State = databases.State;
        Pipeline = _provider.GetRequiredService<RunPipeline>();
        Recorder = _provider.GetRequiredService<RunRecorder>();
        Leases = _provider.GetRequiredService<LeaseRepository>();
        Models = _provider.GetRequiredService<ModelRepository>();
        Baselines = _provider.GetRequiredService<BaselineCache>();
        ManualRuns = new ManualRunRepository(databases.State, StoreCommandRunner.CommandTimeout);
        LeaseDuration = _provider.GetRequiredService<IOptions<DaemonOptions>>().Value.LeaseDuration;
    }

    public TimeProvider Time { get; }

    public NpgsqlDataSource State { get; }

    public RunPipeline Pipeline { get; }

    public RunRecorder Recorder { get; }

    public LeaseRepository Leases { get; }

    public ModelRepository Models { get; }

    /// <summary>The daemon's cache of stored baselines (a replay reads the reference window's end from it).</summary>
    public BaselineCache Baselines { get; }

    /// <summary>The lease claim and recorded-history reads of <c>check --record</c>.</summary>
    public ManualRunRepository ManualRuns { get; }

    /// <summary>How long a claim made by <c>check --record</c> lasts: the daemon's <c>Daemon:LeaseDuration</c>.</summary>
    public TimeSpan LeaseDuration { get; }

    /// <summary>
    /// Runs a command body like the other store commands, with <see cref="OperationException"/> mapped to exit code 3
    /// too and <see cref="OperationRefusal"/> to exit code 2.
    /// </summary>
    public static Task<int> RunAsync(ParseResult parse, string name, Option<string?> database, Func<OperationServices, TextWriter, CancellationToken, Task<int>> body, CancellationToken cancellationToken) =>
        StoreCommandRunner.RunAsync(parse, name, database, async (databases, output, ct) =>
        {
            try
            {
                await using var services = new OperationServices(databases, TimeProvider.System);
                return await body(services, output, ct);
            }
            catch (OperationException ex)
            {
                await parse.InvocationConfiguration.Error.WriteLineAsync($"modelwatch {name}: {ex.Message}");
                return ExitCodes.RuntimeError;
            }
            catch (OperationRefusal ex)
            {
                await parse.InvocationConfiguration.Error.WriteLineAsync($"modelwatch {name}: {ex.Message}");
                return ExitCodes.Usage;
            }
        }, cancellationToken);

    /// <summary>The registered model, or <see cref="ModelNotFoundException"/> naming the closest key (exit code 3).</summary>
    public Task<ModelRecord> ModelAsync(string key, CancellationToken cancellationToken) =>
        ModelKeys.RequireAsync(Models, key, cancellationToken);

    /// <summary>The live run memory of a model, copied into process memory so that nothing is written back.</summary>
    public async Task<InMemoryRunMemory> LiveMemoryAsync(string key, CancellationToken cancellationToken)
    {
        RunRecollection live = await Recorder.RecallAsync(key, cancellationToken);
        return new InMemoryRunMemory(live.Checks, live.Policy, live.LastWindowEnd);
    }

    public ValueTask DisposeAsync() => _provider.DisposeAsync();
}
