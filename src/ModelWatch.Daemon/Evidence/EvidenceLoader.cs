using ModelWatch.Checks.Summaries;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Windows;
using Npgsql;

namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// Assembles the evidence of an alert, of a run, or of a model's recent history from the state database
/// (<see cref="EvidenceRepository"/>) and, for the residual chart, the focus window re-read from the data source.
/// Alert ids and run ids come from separate sequences: each entry point takes one kind.
/// </summary>
internal sealed class EvidenceLoader(StoreDataSources databases, TimeSpan commandTimeout)
{
    /// <summary>How many of the model's runs the history covers.</summary>
    public const int HistoryRuns = EvidenceRepository.HistoryRuns;

    private readonly EvidenceRepository _repository = new(databases.State, commandTimeout);

    /// <summary>The evidence of an alert, or null when no alert has the id.</summary>
    /// <param name="alertId">The alert's id.</param>
    /// <param name="readWindow">Re-read the focus window from the data source for the residual distribution.</param>
    /// <param name="cancellationToken">Cancels the reads.</param>
    public async Task<Evidence?> LoadAlertAsync(long alertId, bool readWindow, CancellationToken cancellationToken)
    {
        var alerts = new AlertRepository(databases.State, commandTimeout);
        if (await alerts.GetAsync(alertId, cancellationToken) is not { } alert)
        {
            return null;
        }

        long? focusId = await _repository.EvidenceRunOfAlertAsync(alert.Model, alert.Check, alert.Subject, alert.LastRunId, cancellationToken)
            ?? alert.LastRunId ?? alert.FirstRunId;
        Evidence evidence = await AssembleAsync(alertId, alert.Model, focusId, cancellationToken) with
        {
            Alert = alert,
            History = await alerts.HistoryAsync(alertId, cancellationToken),
            PreviousAlertId = alert.PreviousAlertId,
        };
        return readWindow ? await WithWindowResidualsAsync(evidence, cancellationToken) : evidence;
    }

    /// <summary>The evidence of a run, or null when no run has the id.</summary>
    public async Task<Evidence?> LoadRunAsync(long runId, bool readWindow, CancellationToken cancellationToken)
    {
        if (await _repository.ModelOfRunAsync(runId, cancellationToken) is not { } model)
        {
            return null;
        }

        Evidence evidence = await AssembleAsync(runId, model, runId, cancellationToken);
        return readWindow ? await WithWindowResidualsAsync(evidence, cancellationToken) : evidence;
    }

    /// <summary>The model's recent history with its latest run as the focus (no window re-read), or null for an unknown model.</summary>
    public async Task<Evidence?> LoadModelAsync(string model, CancellationToken cancellationToken)
    {
        if (await new ModelRepository(databases.State, TimeProvider.System, commandTimeout).GetAsync(model, cancellationToken) is not { } record)
        {
            return null;
        }

        IReadOnlyList<EvidenceRun> runs = await _repository.RunsAsync(model, null, cancellationToken);
        EvidenceRun? latest = runs.Count > 0 ? runs[^1] : null;
        var baselines = new BaselineRepository(databases.State, TimeProvider.System, commandTimeout);
        return new Evidence
        {
            Id = 0,
            Model = model,
            Outcome = (record.Spec.Outcome, record.Spec.OutcomeUnit),
            Focus = latest,
            Runs = runs,
            Baseline = await baselines.GetCurrentAsync(model, cancellationToken),
        };
    }

    private async Task<Evidence> AssembleAsync(long id, string model, long? focusId, CancellationToken cancellationToken)
    {
        IReadOnlyList<EvidenceRun> runs = await _repository.RunsAsync(model, focusId, cancellationToken);
        EvidenceRun? focus = runs.FirstOrDefault(r => r.Id == focusId);
        var baselines = new BaselineRepository(databases.State, TimeProvider.System, commandTimeout);
        StoredBaseline? baseline = focus?.BaselineVersion is { } version
            ? await baselines.GetAsync(model, version, cancellationToken)
            : await baselines.GetCurrentAsync(model, cancellationToken);
        ModelRecord? record = await new ModelRepository(databases.State, TimeProvider.System, commandTimeout).GetAsync(model, cancellationToken);
        return new Evidence
        {
            Id = id,
            Model = model,
            Outcome = record is null ? null : (record.Spec.Outcome, record.Spec.OutcomeUnit),
            Focus = focus,
            Runs = runs,
            Baseline = baseline,
        };
    }

    private async Task<Evidence> WithWindowResidualsAsync(Evidence evidence, CancellationToken cancellationToken)
    {
        if (evidence.Focus is not { WindowStart: { } start, WindowEnd: { } end } || evidence.Baseline is null)
        {
            return evidence with { WindowResidualsProblem = "the run has no window or no baseline" };
        }

        try
        {
            ModelRecord? record = await new ModelRepository(databases.State, TimeProvider.System, commandTimeout).GetAsync(evidence.Model, cancellationToken);
            if (record is null)
            {
                return evidence with { WindowResidualsProblem = "the model is no longer registered" };
            }

            BaselineReference reference = evidence.Baseline.Reference;
            var read = await new WindowReader(databases.ReadOptions()).ReadAsync(
                databases.Source(record.Spec.Source), record.Spec, start, end,
                () => new WindowSummarySink(record.Spec.Layout, reference, new WindowSummaryOptions()), WindowSummarySink.Merge, cancellationToken);
            double[] sample = read.Sink.Builder.Build().ResidualSample;
            return sample.Length == 0
                ? evidence with { WindowResidualsProblem = "the window has no usable rows now" }
                : evidence with { WindowResiduals = sample };
        }
        catch (Exception ex) when (ex is WindowReadException or NpgsqlException or StoreConfigurationException or ArgumentException or InvalidOperationException)
        {
            // The chart is optional evidence: a source that is gone or changed must not stop the report.
            return evidence with { WindowResidualsProblem = "the window could not be re-read: " + ex.Message };
        }
    }
}
