using System.Diagnostics;
using System.Globalization;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Health;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using Npgsql;

namespace ModelWatch.Daemon.Scheduling;

/// <summary>
/// The daemon's loop: every poll it claims due models (up to the free concurrency), runs each through the
/// pipeline on the thread pool, and records the outcome under the lease. A fault in one model is that run's
/// outcome; a fault of the state database backs the loop off with jitter and turns readiness false until it
/// answers again. On shutdown it stops claiming, gives in-flight runs <see cref="DaemonOptions.ShutdownTimeout"/>,
/// then abandons them and releases its leases.
/// </summary>
public sealed class SchedulerService(
    ModelRepository models,
    LeaseRepository leases,
    RunPipeline pipeline,
    RunCompletion completion,
    NpgsqlDataSource state,
    DaemonHealth health,
    IOptions<DaemonOptions> options,
    TimeProvider time,
    ILogger<SchedulerService> logger) : BackgroundService
{
    private readonly Random _jitter = new();
    private readonly SemaphoreSlim _runFinished = new(0);
    private DateTimeOffset _nextScheduleScan = DateTimeOffset.MinValue;
    private readonly HashSet<Task> _inFlight = [];
    private readonly Lock _gate = new();

    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        DaemonOptions settings = options.Value;
        using var runs = new CancellationTokenSource();
        int failures = 0;
        bool migrated = false;
        DaemonLog.LogStarting(logger, settings.WorkerId, settings.Concurrency);
        while (!stoppingToken.IsCancellationRequested)
        {
            TimeSpan wait = settings.PollInterval;
            bool mayHaveMore = false;
            try
            {
                if (!migrated)
                {
                    if (settings.MigrateOnStart)
                    {
                        MigrationResult result = await MigrationRunner.MigrateAsync(state, TimeSpan.FromMinutes(2), stoppingToken);
                        DaemonLog.LogMigrated(logger, result.CurrentVersion, result.Applied.Count);
                    }
                    else
                    {
                        // Without migrating, still refuse a schema of another build: nothing is claimed or written until it matches.
                        int version = await MigrationRunner.EnsureCurrentAsync(state, TimeSpan.FromSeconds(30), stoppingToken);
                        DaemonLog.LogMigrated(logger, version, 0);
                    }

                    migrated = true;
                }

                // New models are rare: look for them once per poll, not on every wake after a finished run.
                if (time.GetUtcNow() >= _nextScheduleScan)
                {
                    await ScheduleNewModelsAsync(stoppingToken);
                    _nextScheduleScan = time.GetUtcNow() + settings.PollInterval;
                }

                int free = settings.Concurrency - InFlightCount;
                if (free > 0)
                {
                    DateTimeOffset now = time.GetUtcNow();
                    IReadOnlyList<ClaimedModel> claimed = await leases.ClaimDueAsync(settings.WorkerId, now, settings.LeaseDuration, free, stoppingToken);
                    foreach (ClaimedModel claim in claimed)
                    {
                        Track(Task.Run(() => RunClaimedAsync(claim, runs.Token), CancellationToken.None));
                    }

                    // Look again as soon as a run finishes: a full claim may have left due models behind, and a
                    // model catching up on missed slots is due again at once.
                    mayHaveMore = claimed.Count > 0;
                }
                else
                {
                    mayHaveMore = true;
                }

                health.DatabaseAvailable();
                health.CycleCompleted();
                failures = 0;
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                break;
            }
            catch (Exception ex) when (ex is NpgsqlException or TimeoutException or System.Net.Sockets.SocketException or MigrationException)
            {
                failures++;
                health.DatabaseUnavailable(ex.Message);
                health.CycleCompleted();
                wait = Backoff(settings, failures);
                DaemonLog.LogDatabaseUnavailable(logger, ex.Message, wait.TotalSeconds);
            }

            try
            {
                await WaitAsync(wait, mayHaveMore, stoppingToken);
            }
            catch (OperationCanceledException)
            {
                break;
            }
        }

        await DrainAsync(settings, runs);
    }

    private int InFlightCount
    {
        get
        {
            lock (_gate)
            {
                return _inFlight.Count;
            }
        }
    }

    private async Task RunClaimedAsync(ClaimedModel claim, CancellationToken cancellationToken)
    {
        DaemonOptions settings = options.Value;
        DateTimeOffset slot = claim.Slot;
        using var leaseLost = new CancellationTokenSource();
        using var run = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken, leaseLost.Token);
        using var renewal = new CancellationTokenSource();
        Task renewing = Task.CompletedTask;
        try
        {
            ModelRecord? model = await models.GetAsync(claim.Key, cancellationToken);
            if (model is null || !model.Enabled)
            {
                await leases.ReleaseAsync(settings.WorkerId, claim.Key, cancellationToken);
                return;
            }

            SlotPlan plan = SlotPlanner.Plan(model.Spec.Schedule, claim.Slot, time.GetUtcNow(), settings.MissedSlots, settings.MaxCatchUpSlots);
            slot = plan.RunSlot;
            if (plan.PassedOver > 0)
            {
                DaemonLog.LogPassedOver(logger, claim.Key, plan.PassedOver, claim.Slot, plan.RunSlot, settings.MissedSlots);
            }

            // A run may outlast its lease (a slow query): the lease is extended while it runs, so no other replica takes
            // the model meanwhile; if it is lost all the same, the run stops rather than race the new owner.
            renewing = RenewWhileRunningAsync(claim.Key, plan.RunSlot, settings, leaseLost, renewal.Token);

            // One trace per run: the read, fit, checks and persist spans, the database calls and the alert events it
            // emits all carry its trace id.
            using Activity? activity = ModelWatchActivitySource.Instance.StartActivity("modelwatch.run");
            activity?.SetTag(TelemetryNames.ModelTag, claim.Key);
            activity?.SetTag("modelwatch.slot", plan.RunSlot.ToString("O", CultureInfo.InvariantCulture));
            RunOutcome outcome = await pipeline.ExecuteAsync(model, plan.RunSlot, run.Token);
            activity?.SetTag(TelemetryNames.StatusTag, outcome.Status.Name());
            await completion.CompleteAsync(model, outcome, plan.NextDue, run.Token);
        }
        catch (OperationCanceledException) when (leaseLost.IsCancellationRequested && !cancellationToken.IsCancellationRequested)
        {
            DaemonLog.LogLeaseLostMidRun(logger, claim.Key, slot);
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            DaemonLog.LogAbandoned(logger, claim.Key, slot, settings.MissedSlots);
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            // Nothing was recorded: the model stays due from its claimed slot and is claimed again when the lease expires;
            // the missed-slot policy then decides whether this slot runs again or is passed over for a later one.
            DaemonLog.LogRunCrashed(logger, ex, claim.Key, slot, time.GetUtcNow() + settings.LeaseDuration, settings.MissedSlots);
        }
        finally
        {
            await renewal.CancelAsync();
            await renewing;
        }
    }

    private async Task RenewWhileRunningAsync(string key, DateTimeOffset slot, DaemonOptions settings, CancellationTokenSource leaseLost, CancellationToken stop)
    {
        TimeSpan every = settings.LeaseDuration / 3;
        while (!stop.IsCancellationRequested)
        {
            try
            {
                await Task.Delay(every, time, stop);
                if (!await leases.RenewAsync(settings.WorkerId, key, time.GetUtcNow(), settings.LeaseDuration, stop))
                {
                    await leaseLost.CancelAsync();
                    return;
                }
            }
            catch (OperationCanceledException) when (stop.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex) when (ex is NpgsqlException or TimeoutException or System.Net.Sockets.SocketException)
            {
                // The lease may still be live; the next attempt, a third of a lease later, may get through.
                DaemonLog.LogRenewFailed(logger, key, slot, ex.Message);
            }
        }
    }

    private async Task WaitAsync(TimeSpan wait, bool wakeOnFinishedRun, CancellationToken stoppingToken)
    {
        if (!wakeOnFinishedRun)
        {
            await Task.Delay(wait, time, stoppingToken);
            return;
        }

        using var either = CancellationTokenSource.CreateLinkedTokenSource(stoppingToken);
        Task delay = Task.Delay(wait, time, either.Token);
        Task finished = _runFinished.WaitAsync(either.Token);
        await Task.WhenAny(delay, finished);
        await either.CancelAsync();
        stoppingToken.ThrowIfCancellationRequested();
    }

    private async Task ScheduleNewModelsAsync(CancellationToken cancellationToken)
    {
        foreach ((string key, string scheduleText) in await leases.UnscheduledAsync(cancellationToken))
        {
            if (Schedule.TryParse(scheduleText, out Schedule? schedule, out _))
            {
                await leases.ScheduleAsync(key, SlotPlanner.FirstSlot(schedule!, time.GetUtcNow()), cancellationToken);
            }
        }
    }

    private void Track(Task task)
    {
        lock (_gate)
        {
            _inFlight.Add(task);
        }

        task.ContinueWith(
            t =>
            {
                lock (_gate)
                {
                    _inFlight.Remove(t);
                }

                _runFinished.Release();
            },
            CancellationToken.None,
            TaskContinuationOptions.ExecuteSynchronously,
            TaskScheduler.Default);
    }

    private async Task DrainAsync(DaemonOptions settings, CancellationTokenSource runs)
    {
        Task[] pending;
        lock (_gate)
        {
            pending = [.. _inFlight];
        }

        if (pending.Length > 0)
        {
            Task all = Task.WhenAll(pending);
            Task timeout = Task.Delay(settings.ShutdownTimeout, time, CancellationToken.None);
            if (await Task.WhenAny(all, timeout) != all)
            {
                await runs.CancelAsync();
                await Task.WhenAny(all, Task.Delay(TimeSpan.FromSeconds(5), CancellationToken.None));
            }
        }

        try
        {
            using var release = new CancellationTokenSource(TimeSpan.FromSeconds(5));
            int released = await leases.ReleaseAllAsync(settings.WorkerId, release.Token);
            DaemonLog.LogStopped(logger, settings.WorkerId, released);
        }
        catch (Exception ex) when (ex is NpgsqlException or OperationCanceledException or TimeoutException)
        {
            DaemonLog.LogReleaseFailed(logger, ex.Message);
        }
    }

    /// <inheritdoc />
    public override void Dispose()
    {
        _runFinished.Dispose();
        base.Dispose();
    }

    private TimeSpan Backoff(DaemonOptions settings, int failures)
    {
        double seconds = Math.Min(settings.MaxBackoff.TotalSeconds, Math.Pow(2, Math.Min(failures, 16)));
        return TimeSpan.FromSeconds(seconds * (0.5 + (0.5 * _jitter.NextDouble())));
    }
}
