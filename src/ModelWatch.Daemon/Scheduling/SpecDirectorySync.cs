using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Daemon.Scheduling;

/// <summary>
/// Applies the specs in <see cref="SpecsOptions.Directory"/> at start and again when files change (debounced), so
/// a ConfigMap or a git checkout can be the source of truth. An invalid folder is logged with every problem and
/// applies nothing; the models already registered keep running.
/// </summary>
public sealed class SpecDirectorySync(
    ModelRepository models,
    IOptions<SpecsOptions> options,
    TimeProvider time,
    ILogger<SpecDirectorySync> logger) : BackgroundService
{
    private static readonly TimeSpan Debounce = TimeSpan.FromSeconds(2);
    private readonly SemaphoreSlim _changed = new(0);

    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (options.Value.Directory is not { Length: > 0 } folder)
        {
            return;
        }

        if (!Directory.Exists(folder))
        {
            DaemonLog.LogMissingFolder(logger, folder);
            return;
        }

        using var watcher = new FileSystemWatcher(folder) { IncludeSubdirectories = false, EnableRaisingEvents = true };
        watcher.Changed += (_, _) => _changed.Release();
        watcher.Created += (_, _) => _changed.Release();
        watcher.Deleted += (_, _) => _changed.Release();
        watcher.Renamed += (_, _) => _changed.Release();
        await SyncAsync(folder, stoppingToken);
        try
        {
            while (!stoppingToken.IsCancellationRequested)
            {
                await _changed.WaitAsync(stoppingToken);
                await Task.Delay(Debounce, time, stoppingToken);
                while (_changed.CurrentCount > 0)
                {
                    await _changed.WaitAsync(stoppingToken);
                }

                await SyncAsync(folder, stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            // Shutting down.
        }
    }

    /// <summary>Applies the folder once; returns false when it was invalid or the database failed.</summary>
    public async Task<bool> SyncAsync(string folder, CancellationToken cancellationToken)
    {
        try
        {
            IReadOnlyList<(ModelSpec Spec, string File)> specs = ModelSpecFiles.Load(folder);
            var outcomes = await models.ApplyAsync([.. specs.Select(s => (s.Spec, (string?)s.File))], options.Value.Prune, cancellationToken);
            DaemonLog.LogSynced(logger, folder, specs.Count, outcomes.Count);
            return true;
        }
        catch (ModelSpecException ex)
        {
            foreach (SpecProblem problem in ex.Problems)
            {
                DaemonLog.LogSpecProblem(logger, problem.ToString());
            }

            return false;
        }
        catch (Exception ex) when (ex is NpgsqlException or IOException or TimeoutException)
        {
            DaemonLog.LogSyncFailed(logger, folder, ex.Message);
            return false;
        }
    }

    /// <inheritdoc />
    public override void Dispose()
    {
        _changed.Dispose();
        base.Dispose();
    }
}
