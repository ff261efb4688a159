using System.Globalization;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Checks.Tests.Support;
using Xunit.Abstractions;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// The whole policy on 10,000 hourly windows with no change (20 trials of 500 windows, each with its own baseline;
/// seeds 1,000,003·3 + trial), default thresholds: one false critical alert per model per year. The count of
/// alerts opened must not exceed the budget for 10,000 hours (1.14) plus binomial slack (its Poisson 99 % point, 4).
/// </summary>
[Trait("Category", "Calibration")]
public sealed class PolicyFalseAlarmTests(ITestOutputHelper output)
{
    private const int Trials = 20;
    private const int WindowsPerTrial = 500;

    [Fact]
    public void No_more_false_alerts_than_the_budget_allows()
    {
        var thresholds = new CheckThresholds { WindowLength = TimeSpan.FromHours(1) };
        int opened = 0;
        var keys = new List<string>();
        for (int trial = 0; trial < Trials; trial++)
        {
            var model = new SyntheticModel(Calibration.Seed(3, trial), Calibration.Features);
            BaselineReference baseline = model.Baseline(Calibration.BaselineRows, seed: trial);
            var harness = new MonitorHarness(baseline, thresholds);
            for (int w = 0; w < WindowsPerTrial; w++)
            {
                foreach (AlertDecision d in harness.Step(model, Calibration.WindowRows).Decisions.Where(d => d.Action == AlertAction.Open))
                {
                    opened++;
                    keys.Add($"{d.Check}/{d.Subject} ({d.Evidence?.Statistic})");
                }
            }
        }

        int windows = Trials * WindowsPerTrial;
        double allowed = thresholds.FalseAlarmsPerYear * windows / FalseAlarmBudget.HoursPerYear;
        int slack = 0;
        while (MathNet.Numerics.Distributions.Poisson.CDF(allowed, slack) < 0.99)
        {
            slack++;
        }

        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{opened} false critical alerts in {windows} null windows (budget {allowed:F2}, limit {slack}); α per test {FalseAlarmBudget.FixedSampleAlpha(thresholds):E2}, CUSUM h {FalseAlarmBudget.CusumThreshold(thresholds):F3}: {string.Join(", ", keys)}"));
        Assert.InRange(opened, 0, slack);
    }
}
