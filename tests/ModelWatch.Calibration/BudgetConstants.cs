using System.Globalization;
using ModelWatch.Checks.Policy;
using ModelWatch.Numerics.Monitoring;

namespace ModelWatch.Calibration;

/// <summary>The budget's derived constants at default settings, as docs/checks.md quotes them.</summary>
public static class BudgetConstants
{
    public static void Write(TextWriter output)
    {
        ArgumentNullException.ThrowIfNull(output);
        var setup = new CalibrationSetup();
        output.WriteLine("| cadence | α per run (one test) | h, one two-sided CUSUM | h, one of 5 | h, one-sided | OLS-CUSUM c (half a channel) |");
        output.WriteLine("|---|---|---|---|---|---|");
        foreach (TimeSpan every in new[] { TimeSpan.FromHours(1), TimeSpan.FromDays(1) })
        {
            var t = new CheckThresholds { Cadence = every };
            output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"| {every.TotalHours:0} h | {FalseAlarmBudget.RunAlpha(t):E2} | {FalseAlarmBudget.CusumThreshold(t):F2} | {FalseAlarmBudget.CusumThreshold(t, 5):F2} | {FalseAlarmBudget.CusumThreshold(t, oneSided: true):F2} | {MonitoringBoundary.CusumCriticalValue(FalseAlarmBudget.EpochAlpha(t, (int)Math.Round(FalseAlarmBudget.RunsPerYear(t)), 2)):F3} |"));
        }

        output.WriteLine();
        output.WriteLine("| design (60 rows an hour, 30-day baseline) | h | runs a window | runs an epoch | paths | epoch size, one ME slope | ME critical value, one of 5 slopes (c / spread) | OLS-MOSUM (c / spread) |");
        output.WriteLine("|---|---|---|---|---|---|---|---|");
        foreach (Cadence cadence in Cadence.All)
        {
            var t = new CheckThresholds { Cadence = cadence.Every, WindowLength = cadence.Window };
            double h = cadence.Window.TotalHours / (setup.BaselineDays * 24.0);
            MovingWindowDesign design = Checks.Coefficients.StructuralChangeMonitors.Design(t, h);
            MovingWindowNull simulated = MovingWindowNull.For(design);
            double spread = MovingWindowNull.Spread(h);
            double me = simulated.StandardizedCriticalValue(FalseAlarmBudget.EpochAlpha(t, design.Evaluations, 5));
            double mosum = simulated.StandardizedCriticalValue(FalseAlarmBudget.EpochAlpha(t, design.Evaluations, 2));
            output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"| {cadence.Label} | {h:G3} (grid {design.Window:G3}) | {design.StepsPerWindow} | {design.Evaluations} | {simulated.Paths} | {FalseAlarmBudget.EpochAlpha(t, design.Evaluations, 5):E2} | {me * spread:F3} ({me:F3}) | {mosum * spread:F3} ({mosum:F3}) |"));
        }
    }
}
