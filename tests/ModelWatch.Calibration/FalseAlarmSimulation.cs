using System.Collections.Concurrent;
using ModelWatch.Checks.Policy;

namespace ModelWatch.Calibration;

/// <summary>
/// Model-years with no change, through every check and the alert policy at default settings: each trial is one model
/// with its own baseline, run for a year of its cadence. Counts the critical alerts opened (all false by construction).
/// </summary>
public static class FalseAlarmSimulation
{
    public static FalseAlarmResult Run(CalibrationSetup setup, Cadence cadence, int modelYears, int stream = 30)
    {
        ArgumentNullException.ThrowIfNull(setup);
        ArgumentNullException.ThrowIfNull(cadence);
        var alerts = new ConcurrentBag<(int Trial, string Key)>();
        int runsPerYear = (int)Math.Round(FalseAlarmBudget.HoursPerYear / cadence.Every.TotalHours);
        Parallel.For(0, modelYears, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, trial =>
        {
            (SyntheticModel model, Checks.Summaries.BaselineReference baseline) = setup.Trial(stream + cadence.Ratio, trial);
            var monitor = new RollingMonitor(model, baseline, cadence, setup.RowsPerHour);
            for (int run = 0; run < runsPerYear; run++)
            {
                foreach (AlertDecision d in monitor.Run().Decisions.Where(d => d.Action == AlertAction.Open && d.EffectiveSeverity == Checks.Findings.Severity.Critical))
                {
                    alerts.Add((trial, $"{d.Check}/{d.Subject ?? "-"} ({d.Evidence?.Statistic})"));
                }
            }
        });

        return new FalseAlarmResult(cadence, modelYears, runsPerYear, [.. alerts.OrderBy(a => a.Trial).ThenBy(a => a.Key, StringComparer.Ordinal)]);
    }
}
