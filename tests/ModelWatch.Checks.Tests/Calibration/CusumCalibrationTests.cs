using System.Globalization;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Summaries;
using ModelWatch.Calibration;
using Xunit.Abstractions;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// In-control run lengths of the bias and variance CUSUMs end to end (window summaries of 500 rows, the persisted state carried
/// between runs), with h derived from a budget whose target ARL0 is 167.68 runs, the two-sided ARL of h = 4, k = 0.5
/// (spc::xcusum.arl; see PageCusumTests). Seeds 1,000,003·2 + trial.
/// </summary>
[Trait("Category", "Calibration")]
public sealed class CusumCalibrationTests(ITestOutputHelper output)
{
    private const int MinimumWindows = 20_000;
    private const double TableArl = 167.68;

    [Fact]
    public void In_control_run_length_matches_the_table()
    {
        var thresholds = new CheckThresholds { AlarmChannels = 1, FalseAlarmsPerYear = FalseAlarmBudget.HoursPerYear / TableArl, Cadence = TimeSpan.FromHours(1), WindowLength = TimeSpan.FromHours(1) };
        double h = FalseAlarmBudget.CusumThreshold(thresholds);
        Assert.Equal(4.0, h, 2);
        var bias = new List<int>();
        var variance = new List<int>();
        int windows = 0;
        var start = new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
        for (int trial = 0; windows < MinimumWindows; trial++)
        {
            var model = new SyntheticModel(Calibration.Seed(2, trial), Calibration.Features);
            BaselineReference baseline = model.Baseline(Calibration.BaselineRows, seed: trial);
            var state = new ResidualsState();
            int? biasRun = null;
            int? varianceRun = null;
            for (int run = 1; run <= 20 * TableArl && (biasRun is null || varianceRun is null); run++)
            {
                var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions { ReservoirSize = 20 });
                for (int i = 0; i < Calibration.WindowRows; i++)
                {
                    (double[] x, double y) = model.Row();
                    builder.AddRow(x, y);
                }

                DateTimeOffset end = start.AddHours(run);
                var input = new CheckInput { Baseline = baseline, Window = builder.Build(), WindowStart = end.AddHours(-1), WindowEnd = end, Thresholds = thresholds };
                (IReadOnlyList<Finding> findings, state) = ResidualCusums.Step(input, state);
                windows++;
                biasRun ??= findings[0].Severity == Severity.Critical ? run : null;
                varianceRun ??= findings[1].Severity == Severity.Critical ? run : null;
            }

            if (biasRun is { } b)
            {
                bias.Add(b);
            }

            if (varianceRun is { } v)
            {
                variance.Add(v);
            }
        }

        foreach ((string name, List<int> lengths) in new[] { ("bias", bias), ("variance", variance) })
        {
            double mean = lengths.Average();
            double sd = Math.Sqrt(lengths.Sum(r => (r - mean) * (r - mean)) / (lengths.Count - 1));
            double se = sd / Math.Sqrt(lengths.Count);
            output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{name} CUSUM h = {h:F4}; {lengths.Count} run lengths over {windows} windows: mean ARL0 = {mean:F1} (SE {se:F1}), table {TableArl}"));
            Assert.InRange(mean, TableArl - (3 * se), TableArl + (3 * se));
        }
    }
}
