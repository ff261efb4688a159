using System.Diagnostics;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Checks.Source;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Daemon.Runs;
using ModelWatch.Daemon.Telemetry;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Windows;
using Npgsql;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// One run of one model at one slot: read the window in a single pass into the summary builder, fit, run the
/// checks against the baseline with the persisted sequential state, and let the alert policy decide. Faults become
/// the run's outcome (<c>failed</c> with the reason, <c>skipped</c> for want of rows or of a baseline), never an
/// exception, so one bad model cannot stop the loop; a failed run still carries the <c>source</c> check's verdict, so
/// runs that keep failing open an alert. Only cancellation (shutdown) and state-database faults propagate. The caller
/// owns the <c>modelwatch.run</c> span; the stages here are its children.
/// </summary>
public sealed class RunPipeline(
    StoreDataSources databases,
    BaselineCache baselines,
    RunRecorder recorder,
    WindowReader reader,
    TimeProvider time)
{
    /// <summary>Runs a model for a slot, with the memory of earlier runs kept in the state database.</summary>
    public Task<RunOutcome> ExecuteAsync(ModelRecord model, DateTimeOffset slot, CancellationToken cancellationToken) =>
        ExecuteAsync(model, slot, recorder, cancellationToken);

    /// <summary>Runs a model for a slot with the given memory of earlier runs (a backtest keeps it in memory).</summary>
    public async Task<RunOutcome> ExecuteAsync(ModelRecord model, DateTimeOffset slot, IRunMemory memory, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(memory);
        ModelSpec spec = model.Spec;
        DateTimeOffset started = time.GetUtcNow();
        (DateTimeOffset start, DateTimeOffset end) = spec.WindowForSlot(slot);
        var outcome = new RunOutcome { ModelKey = spec.Key, Slot = slot, Status = RunStatus.Ok, StartedAt = started, WindowStart = start, WindowEnd = end };

        if (model.BaselineProblem is { } problem)
        {
            return outcome with { Status = RunStatus.Skipped, Reason = (model.BaselineVersion is null ? "no_baseline: " : "baseline_incompatible: ") + problem };
        }

        StoredBaseline? baseline = await baselines.GetAsync(spec.Key, model.BaselineVersion!.Value, cancellationToken);
        if (baseline is null)
        {
            return outcome with { Status = RunStatus.Skipped, Reason = "no_baseline: the baseline disappeared while the run started" };
        }

        outcome = outcome with { BaselineVersion = baseline.Version, BaselineFingerprint = baseline.Reference.Fingerprint };

        // Nothing else writes this model's memory while the lease is held, so it is read once, before the window. A state
        // database fault here is not the model's: it propagates, the run is not recorded, and the slot is retried.
        RunRecollection recollection = await memory.RecallAsync(spec.Key, cancellationToken);
        CheckThresholds thresholds;
        try
        {
            thresholds = SpecThresholds.For(spec, started);
        }
        catch (ArgumentException ex)
        {
            return Failed(outcome, recollection, baseline, "bad_thresholds: " + ex.Message, "bad_thresholds", new CheckThresholds());
        }

        var stages = new Dictionary<string, double>(StringComparer.Ordinal);

        WindowReadResult<WindowSummarySink> read;
        long t0 = time.GetTimestamp();
        using (Activity? span = ModelWatchActivitySource.Instance.StartActivity("modelwatch.run.read"))
        {
            try
            {
                NpgsqlDataSource source = databases.Source(spec.Source);
                var options = new WindowSummaryOptions();
                // Rows after both the previous run's window and the baseline's reference window are new: the sequential
                // statistics consume only rows that no earlier fit has seen.
                DateTimeOffset? lastEnd = recollection.LastWindowEnd;
                DateTimeOffset? newFrom = (lastEnd, baseline.ReferenceWindowEnd) switch
                {
                    ({ } a, { } b) => a > b ? a : b,
                    (var a, var b) => a ?? b,
                };
                read = await reader.ReadAsync(
                    source, spec, start, end, () => new WindowSummarySink(spec.Layout, baseline.Reference, options), WindowSummarySink.Merge, newFrom, cancellationToken);
                span?.SetTag("modelwatch.rows.read", read.RowsRead);
            }
            catch (WindowReadException ex)
            {
                span?.SetStatus(ActivityStatusCode.Error, ex.Message);
                return Failed(outcome, recollection, baseline, ex.Message, ex.SqlState ?? ex.Failure.ToString(), thresholds);
            }
            catch (Exception ex) when (ex is NpgsqlException or StoreConfigurationException or TimeoutException && !cancellationToken.IsCancellationRequested)
            {
                span?.SetStatus(ActivityStatusCode.Error, ex.Message);
                return Failed(outcome, recollection, baseline, $"model {spec.Key}: {ex.Message}", (ex as PostgresException)?.SqlState ?? ex.GetType().Name, thresholds);
            }
        }

        stages["read"] = time.GetElapsedTime(t0).TotalSeconds;
        outcome = outcome with { RowsRead = read.RowsRead, RowsRejected = read.RowsRejected, RejectedReasons = read.RejectedReasons, NewestRowTime = read.NewestRowTime };

        long t1 = time.GetTimestamp();
        WindowSummary summary;
        using (ModelWatchActivitySource.Instance.StartActivity("modelwatch.run.fit"))
        {
            summary = read.Sink.Builder.Build();
        }

        stages["fit"] = time.GetElapsedTime(t1).TotalSeconds;
        long t2 = time.GetTimestamp();
        IReadOnlyList<CheckResult> results;
        IReadOnlyList<AlertDecision> decisions;
        using (ModelWatchActivitySource.Instance.StartActivity("modelwatch.run.checks"))
        {
            results = ModelChecks.Run(baseline.Reference, summary, start, end, recollection.Checks, thresholds, read.NewestRowTime);
            decisions = AlertPolicy.Evaluate(results, recollection.Policy, baseline.Reference.Fingerprint, thresholds);
        }

        stages["checks"] = time.GetElapsedTime(t2).TotalSeconds;
        CheckResult? data = results.FirstOrDefault(r => r.Check == CheckNames.Data);
        bool insufficient = data is { Skipped: true } || results.Where(r => r.Check is not (CheckNames.Data or CheckNames.Source)).All(r => r.SkipReason == SkipReasons.InsufficientData);
        return outcome with
        {
            Status = insufficient ? RunStatus.Skipped : RunStatus.Ok,
            Reason = insufficient ? $"{SkipReasons.InsufficientData}: {read.RowsAccepted} usable row(s) in [{start:yyyy-MM-ddTHH:mm:ssZ}, {end:yyyy-MM-ddTHH:mm:ssZ}), min_rows is {spec.MinRows}" : null,
            Results = results,
            Decisions = decisions,
            StageSeconds = stages,
            Measurements = MeasurementsOf(summary, baseline.Reference, results),
        };
    }

    /// <summary>
    /// A failed run: the <c>source</c> check counts it, and the alert policy decides on that check alone (the other
    /// checks' states and alerts are left as they were: nothing was measured).
    /// </summary>
    private static RunOutcome Failed(RunOutcome outcome, RunRecollection recollection, StoredBaseline baseline, string reason, string errorType, CheckThresholds thresholds)
    {
        string fingerprint = baseline.Reference.Fingerprint;
        CheckResult source = SourceCheck.Failed(outcome.ModelKey, recollection.Checks.GetValueOrDefault(CheckNames.Source), fingerprint, reason, outcome.StartedAt, thresholds);
        IReadOnlyList<AlertDecision> decisions = AlertPolicy.Evaluate([source], recollection.Policy.Where(p => p.Check == CheckNames.Source), fingerprint, thresholds);
        return outcome with { Status = RunStatus.Failed, Reason = reason, ErrorType = errorType, Results = [source], Decisions = decisions };
    }

    private static RunMeasurements MeasurementsOf(WindowSummary summary, BaselineReference baseline, IReadOnlyList<CheckResult> results)
    {
        List<Finding> findings = results.SelectMany(r => r.Findings).Where(f => !f.Skipped && f.Value is not null).ToList();
        double rmse = summary.RowsAccepted > 0 ? Math.Sqrt(summary.DeployedErrorSumOfSquares / summary.RowsAccepted) : double.NaN;
        return new RunMeasurements(
            RmseRatio: rmse / baseline.ResidualStandardDeviation,
            ConditionNumber: summary.Fit?.ConditionNumber ?? double.NaN,
            MaxCoefficientZ: findings.Where(f => f.Check == CheckNames.Coefficients && f.Statistic == "z").Select(f => Math.Abs(f.Value!.Value)).DefaultIfEmpty(double.NaN).Max(),
            MaxPsi: findings.Where(f => f.Statistic == "psi").Select(f => f.Value!.Value).DefaultIfEmpty(double.NaN).Max());
    }
}
