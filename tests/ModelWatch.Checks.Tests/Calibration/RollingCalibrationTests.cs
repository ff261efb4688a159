using System.Globalization;
using MathNet.Numerics.Distributions;
using ModelWatch.Calibration;
using Xunit.Abstractions;

namespace ModelWatch.Checks.Tests.Calibration;

/// <summary>
/// The whole policy on rolling windows, shortened for CI (the full runs are a bench command, docs/checks.md): hourly rows
/// (60 an hour), a 30-day baseline, 5 features, default settings, for window/cadence ratios 1 (1 h window hourly),
/// 7 (7-day window daily) and 24 (24 h window hourly). False critical alerts must stay within the budget of one per
/// model-year (with Poisson slack for the few years simulated here); at ratio 7 each change must be caught within the
/// asked delays, by the check meant for it, naming the right subject.
/// </summary>
[Trait("Category", "Calibration")]
public sealed class RollingCalibrationTests(ITestOutputHelper output)
{
    private static readonly CalibrationSetup Setup = new();

    public static TheoryData<int, int> FalseAlarmCases => new() { { 1, 1 }, { 7, 6 }, { 24, 1 } };

    public static TheoryData<string> Scenarios => [.. Scenario.All.Select(s => s.Name)];

    [Theory]
    [MemberData(nameof(FalseAlarmCases))]
    public void No_more_false_critical_alerts_than_the_budget_allows(int ratio, int modelYears)
    {
        FalseAlarmResult result = FalseAlarmSimulation.Run(Setup, Cadence.All.Single(c => c.Ratio == ratio), modelYears);
        output.WriteLine(FalseAlarmResult.Header);
        output.WriteLine(result.Row());

        // One a model-year is the budget; allow the Poisson 99 % point of that many years.
        int limit = 0;
        while (Poisson.CDF(modelYears, limit) < 0.99)
        {
            limit++;
        }

        Assert.InRange(result.Alerts.Count, 0, limit);
    }

    [Theory]
    [MemberData(nameof(Scenarios))]
    public void At_ratio_7_each_change_is_caught_within_the_asked_delay_naming_its_subject(string name)
    {
        Scenario scenario = Scenario.All.Single(s => s.Name == name);
        DetectionResult result = DetectionSimulation.Run(Setup, Cadence.Ratio7, scenario, trials: 20);
        output.WriteLine(DetectionResult.Header);
        output.WriteLine(result.Row(Cadence.Ratio7.Every));
        Assert.True(result.Median <= scenario.Target.Median, $"median delay {result.Median} runs, asked ≤ {scenario.Target.Median}");
        Assert.True(result.P95 <= scenario.Target.P95, $"95th percentile {result.P95} runs, asked ≤ {scenario.Target.P95}");
        Assert.True(result.NamedShare >= 0.9, string.Create(CultureInfo.InvariantCulture, $"named right in {result.NamedShare:P0} of trials"));
        Assert.Equal(0, result.AlertsBefore);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(24)]
    public void At_ratios_1_and_24_every_change_is_caught_by_its_check(int ratio)
    {
        Cadence cadence = Cadence.All.Single(c => c.Ratio == ratio);
        output.WriteLine(DetectionResult.Header);
        foreach (Scenario scenario in Scenario.All)
        {
            DetectionResult result = DetectionSimulation.Run(Setup, cadence, scenario, trials: 6);
            output.WriteLine(result.Row(cadence.Every));
            Assert.Equal(result.Trials.Count, result.Caught);
            Assert.True(result.NamedShare >= 0.8, $"{scenario.Name}: named right in {result.NamedShare:P0}");
        }
    }
}
