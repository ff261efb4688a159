using System.Collections.Concurrent;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Calibration;

/// <summary>
/// Detection delay in runs: each trial watches a clean model until its window is full and a few runs more (or as many
/// runs as asked, to place the change late in the monitors' epoch), then the change starts at a run boundary; the delay is the run after the change at which the alert meant for it opens
/// (1 = the first run that saw changed rows).
/// </summary>
public static class DetectionSimulation
{
    public static DetectionResult Run(CalibrationSetup setup, Cadence cadence, Scenario scenario, int trials, int cap = 30, int stream = 40, int? warmupRuns = null)
    {
        ArgumentNullException.ThrowIfNull(setup);
        ArgumentNullException.ThrowIfNull(cadence);
        ArgumentNullException.ThrowIfNull(scenario);
        var outcomes = new ConcurrentBag<DetectionTrial>();
        int warmup = warmupRuns ?? (cadence.Ratio + 3);
        int streamId = stream + (10 * cadence.Ratio) + Scenario.All.ToList().IndexOf(scenario);
        Parallel.For(0, trials, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, trial =>
        {
            (SyntheticModel model, Checks.Summaries.BaselineReference baseline) = setup.Trial(streamId, trial);
            var monitor = new RollingMonitor(model, baseline, cadence, setup.RowsPerHour);
            var before = new List<string>();
            for (int run = 0; run < warmup; run++)
            {
                before.AddRange(monitor.Run().Decisions.Where(d => d.Action == AlertAction.Open).Select(d => $"{d.Check}/{d.Subject ?? "-"} ({d.Evidence?.Statistic})"));
            }

            model.Change = scenario.Change;
            int? delay = null;
            bool misnamed = false;
            for (int run = 1; run <= cap && delay is null; run++)
            {
                IReadOnlyList<AlertDecision> decisions = monitor.Run().Decisions;
                misnamed |= decisions.Any(scenario.Misnames);
                delay = decisions.Any(scenario.Catches) ? run : null;
            }

            outcomes.Add(new DetectionTrial(trial, delay, misnamed, before));
        });

        return new DetectionResult(cadence, scenario, cap, [.. outcomes.OrderBy(o => o.Trial)]);
    }
}
