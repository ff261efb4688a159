using System.Globalization;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Summaries;
using ModelWatch.Checks.Tests.Support;
using Xunit.Abstractions;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// What the CUSUM is for (issue 4 §3): a small persistent shift opens an alert well before the daily fixed-sample
/// tests can confirm it, and one noisy window opens nothing. Default thresholds (hourly runs over a 24 h window, so the
/// fixed-sample tests run once a day); seeds 1,000,003·20 + trial and 1,000,003·21 + trial.
/// </summary>
[Trait("Category", "Calibration")]
public sealed class SequentialDetectionTests(ITestOutputHelper output)
{
    private const int Trials = 40;

    [Fact]
    public void A_small_persistent_bias_opens_an_alert_through_the_CUSUM_before_the_daily_tests_can()
    {
        // 21 new rows an hour ≈ 500 a day. A 0.25 σ bias gives a daily bias t of about 5: the persistent daily test needs
        // two daily windows (about 51 runs here); the CUSUM gains about 0.6 a run against h = 10.2.
        var thresholds = new CheckThresholds();
        var delays = new List<int>();
        int byCusum = 0;
        const int cap = 72;
        for (int trial = 0; trial < Trials; trial++)
        {
            var model = new SyntheticModel(Calibration.Seed(20, trial), Calibration.Features);
            BaselineReference baseline = model.Baseline(Calibration.BaselineRows, seed: trial);
            model.Change = new Shift { Bias = 0.25 };
            var harness = new MonitorHarness(baseline, thresholds);
            int delay = cap + 1;
            for (int run = 1; run <= cap; run++)
            {
                var step = harness.StepRolling(model, 21);
                if (step.Decisions.Any(d => d.Action == AlertAction.Open && d.Check == "residuals"))
                {
                    delay = run;
                    byCusum += step.Results.Single(r => r.Check == "residuals").Findings.Any(f => f.Statistic == "cusum" && f.Severity == Findings.Severity.Critical) ? 1 : 0;
                    break;
                }
            }

            delays.Add(delay);
        }

        delays.Sort();
        int p95 = delays[(int)Math.Ceiling(0.95 * Trials) - 1];
        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"bias 0.25σ, hourly runs of 21 rows, 24 h windows: residuals alert opened in {delays.Count(d => d <= cap)}/{Trials} trials ({byCusum} by the CUSUM); median delay {delays[Trials / 2]} runs, 95th percentile {p95}, max {delays[^1]}"));
        Assert.True(p95 <= 36, $"95th percentile delay {p95} runs");
        Assert.True(byCusum >= 0.95 * Trials, $"only {byCusum} alerts came from the CUSUM");
    }

    [Fact]
    public void One_noisy_window_opens_nothing()
    {
        var thresholds = new CheckThresholds { WindowLength = TimeSpan.FromHours(1) };
        int opened = 0;
        for (int trial = 0; trial < Trials; trial++)
        {
            var model = new SyntheticModel(Calibration.Seed(21, trial), Calibration.Features);
            BaselineReference baseline = model.Baseline(Calibration.BaselineRows, seed: trial);
            var harness = new MonitorHarness(baseline, thresholds);
            for (int w = 1; w <= 6; w++)
            {
                // Window 2 alone is off by 0.2 σ: a bias t of about 4, as extreme as chance makes one window in tens of
                // thousands and near the budgeted critical value (about 4.4).
                model.Change = w == 2 ? new Shift { Bias = 0.2 } : Shift.None;
                opened += harness.Step(model, Calibration.WindowRows).Decisions.Count(d => d.Action == AlertAction.Open);
            }
        }

        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"one noisy window: {opened} alerts opened in {Trials} trials"));
        Assert.Equal(0, opened);
    }
}
