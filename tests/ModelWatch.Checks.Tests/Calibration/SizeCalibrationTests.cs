using System.Globalization;
using ModelWatch.Checks.Coefficients;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Features;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.PredictionError;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Summaries;
using ModelWatch.Calibration;
using Xunit.Abstractions;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// Size of every per-run test at α = 0.05 over 2,000 windows with no change (seeds 1,000,003·1 + trial): the
/// rejection count must fall inside the binomial 99 % interval of 0.05.
/// </summary>
[Trait("Category", "Calibration")]
public sealed class SizeCalibrationTests(ITestOutputHelper output)
{
    private const int Trials = 2000;

    private static readonly (string Check, string Statistic, string? Subject, bool Raw)[] Tests =
    [
        (CheckNames.Coefficients, "wald", null, false),
        (CheckNames.Coefficients, "chow", null, false),
        (CheckNames.Coefficients, "z", "x1", true),
        (CheckNames.Error, "chow_predictive", null, false),
        (CheckNames.Residuals, "bias_t", null, false),
        (CheckNames.Residuals, "brown_forsythe", null, false),
        (CheckNames.Residuals, "variance_ratio", null, false),
        (CheckNames.Residuals, "ks", null, false),
        (CheckNames.Residuals, "anderson_darling", null, false),
        (CheckNames.Residuals, "koenker_bp", null, false),
        (CheckNames.Residuals, "ljung_box", null, false),
        (CheckNames.Features, "psi", "x1", false),
        (CheckNames.Features, "ks", "x1", true),
        (CheckNames.Features, "leverage_exceedance", null, false),
    ];

    // The checks these tests belong to; collinearity has no test here (its effect sizes get a resampled null instead).
    private static readonly IModelCheck[] Checked = [CoefficientsCheck.Instance, ErrorCheck.Instance, ResidualsCheck.Instance, FeaturesCheck.Instance];

    [Fact]
    public void Every_per_run_test_holds_its_size_at_five_percent()
    {
        var rejections = new int[Tests.Length];
        var thresholds = new CheckThresholds { AlphaOverride = 0.05 };
        var start = new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
        for (int trial = 0; trial < Trials; trial++)
        {
            var model = new SyntheticModel(Calibration.Seed(1, trial), Calibration.Features);
            BaselineReference baseline = model.Baseline(Calibration.BaselineRows, seed: trial);
            WindowSummary window = model.Window(baseline, Calibration.WindowRows, seed: trial + 1);
            var input = new CheckInput { Baseline = baseline, Window = window, WindowStart = start, WindowEnd = start.AddHours(1), Thresholds = thresholds };
            CheckResult[] results = [.. Checked.Select(c => c.Run(input))];
            for (int t = 0; t < Tests.Length; t++)
            {
                Finding f = Calibration.Find(results, Tests[t].Check, Tests[t].Statistic, Tests[t].Subject)
                    ?? throw new InvalidOperationException($"{Tests[t].Check}/{Tests[t].Statistic} did not run");
                double p = Tests[t].Raw ? f.Details["raw_p_value"] : f.PValue!.Value;
                rejections[t] += p < 0.05 ? 1 : 0;
            }
        }

        (int low, int high) = Calibration.Binomial99(0.05, Trials);
        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"binomial 99 % interval for {Trials} windows at 0.05: [{low}, {high}]"));
        for (int t = 0; t < Tests.Length; t++)
        {
            output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"size {Tests[t].Check}/{Tests[t].Statistic}{(Tests[t].Subject is null ? "" : "/" + Tests[t].Subject)}: {rejections[t]}/{Trials} = {rejections[t] / (double)Trials:F4}"));
        }

        Assert.All(Enumerable.Range(0, Tests.Length), t => Assert.InRange(rejections[t], low, high));
    }
}
