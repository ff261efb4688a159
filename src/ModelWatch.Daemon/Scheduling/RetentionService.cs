using Dapper;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using Npgsql;

namespace ModelWatch.Daemon.Scheduling;

/// <summary>
/// Deletes runs (and, by cascade, their findings) older than <see cref="RetentionOptions.RunMaxAge"/> in small
/// batches, so no statement holds locks for long. Alerts, their history and baselines are kept.
/// </summary>
public sealed class RetentionService(
    NpgsqlDataSource state,
    IOptions<RetentionOptions> options,
    TimeProvider time,
    ILogger<RetentionService> logger) : BackgroundService
{
    private const string PruneSql = """
        DELETE FROM modelwatch.run
         WHERE id IN (SELECT id FROM modelwatch.run WHERE started_at < @cutoff ORDER BY id LIMIT @batch)
        """;

    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                await PruneAsync(stoppingToken);
                await Task.Delay(options.Value.Interval, time, stoppingToken);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                break;
            }
            catch (Exception ex) when (ex is NpgsqlException or TimeoutException)
            {
                DaemonLog.LogPruneFailed(logger, ex.Message);
                await Task.Delay(TimeSpan.FromMinutes(5), time, stoppingToken).ContinueWith(_ => { }, TaskScheduler.Default);
            }
        }
    }

    /// <summary>Prunes everything past the retention age; returns the runs deleted.</summary>
    public async Task<long> PruneAsync(CancellationToken cancellationToken)
    {
        RetentionOptions settings = options.Value;
        DateTimeOffset cutoff = time.GetUtcNow() - settings.RunMaxAge;
        long total = 0;
        int deleted;
        do
        {
            await using NpgsqlConnection connection = await state.OpenConnectionAsync(cancellationToken);
            deleted = await connection.ExecuteAsync(new CommandDefinition(PruneSql, new { cutoff, batch = settings.BatchSize }, commandTimeout: 60, cancellationToken: cancellationToken));
            total += deleted;
        }
        while (deleted == settings.BatchSize && !cancellationToken.IsCancellationRequested);

        if (total > 0)
        {
            DaemonLog.LogPruned(logger, total, cutoff);
        }

        return total;
    }
}
