using System.Globalization;
using ModelWatch.Calibration;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.Policy;
using ModelWatch.Checks.Source;
using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Tests.Evaluation;

/// <summary>
/// Every registered check, on windows that give ok, warning and critical findings: the fields of each finding that ran
/// say what its text says, so an operator reading either reads the same numbers.
/// </summary>
public sealed class FindingFieldsTests
{
    private static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Every_finding_prints_its_value_p_value_and_limit_and_its_fields_are_in_range()
    {
        List<Finding> findings = [.. Scenarios().SelectMany(r => r.Findings).Where(f => !f.Skipped)];

        Assert.Equal(CheckRegistry.Names.Order(StringComparer.Ordinal), findings.Select(f => f.Check).Distinct().Order(StringComparer.Ordinal));
        Assert.Contains(findings, f => f.Severity == Severity.Ok);
        Assert.Contains(findings, f => f.Severity == Severity.Warning);
        Assert.Contains(findings, f => f.Severity == Severity.Critical);
        Assert.All(findings, AgreesWithItsText);
    }

    [Fact]
    public void Anderson_Darling_reports_the_standardized_statistic_its_text_prints_and_a_huge_one_is_never_p_1()
    {
        var model = new SyntheticModel(seed: 43, features: 2);
        BaselineReference baseline = model.Baseline(2000);
        model.Change = new Shift { Bias = 3.0 };
        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, model.Window(baseline, 2000), Start, Start.AddHours(1), null);
        Finding ad = results.Single(r => r.Check == CheckNames.Residuals).Findings.Single(f => f.Statistic == "anderson_darling");

        // A 3-SD shift of 2,000 errors is far beyond Scholz & Stephens' table (largest critical value 6.546 for k = 2).
        Assert.True(ad.Value > 6.546, "T = " + ad.Value);
        Assert.Contains("T = " + FindingText.Num(ad.Value!.Value), ad.Explanation, StringComparison.Ordinal);
        Assert.Equal(AndersonDarlingKSample.SmallestTabulatedPValue, ad.PValue);
        Assert.Equal(Severity.Warning, ad.Severity);
        Assert.Contains("at most: beyond the table", ad.Explanation, StringComparison.Ordinal);
        Assert.True(ad.Details["a2"] > 0);
    }

    [Fact]
    public void A_per_coefficient_z_carries_both_its_budgeted_alpha_and_its_critical_z()
    {
        var model = new SyntheticModel(seed: 44, features: 3);
        BaselineReference baseline = model.Baseline(2000);
        model.Change = new Shift { CoefficientFeature = 0, CoefficientChange = 1.0 };
        var thresholds = new CheckThresholds();
        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, model.Window(baseline, 1000), Start, Start.AddHours(1), null, thresholds);
        Finding z = results.Single(r => r.Check == CheckNames.Coefficients).Findings.Single(f => f.Statistic == "z" && f.Subject == "x1");
        double alpha = FalseAlarmBudget.RunAlpha(thresholds, 1);
        Assert.Equal(alpha, z.Alpha);
        Assert.Equal(alpha, z.Threshold);

        // The smallest p-value is Holm's first step, tested at α/p for p = 4 coefficients, two-sided.
        Assert.Equal(StandardDistributions.NormalUpperQuantile(alpha / 8.0), z.Limit!.Value, 12);
        Assert.True(Math.Abs(z.Value!.Value) > z.Limit.Value);
        Assert.Equal(Severity.Critical, z.Severity);
    }

    private static void AgreesWithItsText(Finding f)
    {
        string where = f.Check + "/" + f.Statistic + (f.Subject is null ? string.Empty : "/" + f.Subject) + ": " + f.Explanation;
        Assert.True(f.Value is null || double.IsFinite(f.Value.Value), where);
        Assert.True(f.PValue is null || f.PValue is >= 0.0 and <= 1.0, where);
        Assert.True(f.Alpha is null || f.Alpha is > 0.0 and < 1.0, where);
        Assert.True(f.Limit is null || double.IsFinite(f.Limit.Value), where);
        Assert.True(f.Alpha is null || f.PValue is not null, "an alpha without a p-value: " + where);
        Assert.Equal(f.Alpha ?? f.Limit, f.Threshold);
        if (f.Value is { } value)
        {
            Assert.True(Printed(f.Explanation, value), "value " + value.ToString("R", CultureInfo.InvariantCulture) + " not in " + where);
        }

        if (f.PValue is { } p)
        {
            Assert.Contains(FindingText.P(p), f.Explanation, StringComparison.Ordinal);
        }

        if (f.Alpha is { } alpha && f.Explanation.Contains('α', StringComparison.Ordinal))
        {
            Assert.Contains("α " + FindingText.Level(alpha), f.Explanation, StringComparison.Ordinal);
        }

        if (f.Limit is { } limit)
        {
            Assert.True(Printed(f.Explanation, limit), "limit " + limit.ToString("R", CultureInfo.InvariantCulture) + " not in " + where);
        }
    }

    // The checks print a number with Num, a share with Pct or Share and a count as the integer it is.
    private static bool Printed(string text, double value) =>
        text.Contains(FindingText.Num(value), StringComparison.Ordinal)
        || text.Contains(FindingText.Pct(value), StringComparison.Ordinal)
        || text.Contains(FindingText.Share(value), StringComparison.Ordinal)
        || (value == Math.Round(value) && Math.Abs(value) < 1e15 && text.Contains(((long)value).ToString(CultureInfo.InvariantCulture), StringComparison.Ordinal));

    private static IEnumerable<CheckResult> Scenarios()
    {
        // No change: mostly ok.
        foreach (CheckResult r in Runs(new SyntheticModel(seed: 41, features: 4), Shift.None, runs: 4, rows: 400))
        {
            yield return r;
        }

        // Every kind of change at once: critical per-run tests, CUSUM crossings and warnings on the way.
        var changed = new Shift { CoefficientFeature = 0, CoefficientChange = 0.8, Bias = 0.6, VarianceFactor = 2.5, CorrelateFeature = 2, CorrelateWith = 1, Correlation = 0.995, MeanShiftFeature = 3, MeanShift = 1.5 };
        foreach (CheckResult r in Runs(new SyntheticModel(seed: 42, features: 4), changed, runs: 4, rows: 400))
        {
            yield return r;
        }

        // A small change: warnings and CUSUMs partway up.
        foreach (CheckResult r in Runs(new SyntheticModel(seed: 45, features: 3), new Shift { Bias = 0.2 }, runs: 3, rows: 300))
        {
            yield return r;
        }

        var model = new SyntheticModel(seed: 46, features: 2);
        BaselineReference baseline = model.Baseline(1000);
        double[] b0 = baseline.CoefficientVector();

        // Stale served predictions, rejected rows and a serially correlated small window.
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        double noise = 0.0;
        for (int i = 0; i < 80; i++)
        {
            (double[] x, _) = model.Row();
            noise = (0.8 * noise) + (0.6 * model.Normal());
            builder.AddRow(x, b0[0] + (b0[1] * x[0]) + (b0[2] * x[1]) + noise, b0[0] + (b0[1] * x[0] * 0.9) + (b0[2] * x[1]));
            if (i % 10 == 0)
            {
                builder.AddRow([double.NaN, x[1]], 1.0);
            }
        }

        foreach (CheckResult r in ModelChecks.Run(baseline, builder.Build(), Start, Start.AddHours(1), null, newestRowTime: Start.AddHours(1)))
        {
            yield return r;
        }

        // A constant feature (lost rank) and a source that stopped filling.
        var constant = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < 200; i++)
        {
            (double[] x, double y) = model.Row();
            constant.AddRow([x[0], 4.0], y);
        }

        foreach (CheckResult r in ModelChecks.Run(baseline, constant.Build(), Start, Start.AddHours(1), null, newestRowTime: Start.AddDays(-3)))
        {
            yield return r;
        }

        // A quiet source, run after run, and runs that failed.
        IReadOnlyDictionary<string, CheckState>? states = null;
        for (int run = 0; run < 4; run++)
        {
            IReadOnlyList<CheckResult> quiet = ModelChecks.Run(baseline, model.Window(baseline, 0), Start.AddHours(run), Start.AddHours(run + 1), states);
            states = quiet.ToDictionary(r => r.Check, r => r.State, StringComparer.Ordinal);
            foreach (CheckResult r in quiet)
            {
                yield return r;
            }
        }

        CheckState? source = null;
        for (int run = 0; run < 3; run++)
        {
            CheckResult failed = SourceCheck.Failed("findings-model", source, "b1", "connection refused", Start.AddHours(run), new CheckThresholds());
            source = failed.State;
            yield return failed;
        }
    }

    private static IEnumerable<CheckResult> Runs(SyntheticModel model, Shift change, int runs, int rows)
    {
        BaselineReference baseline = model.Baseline(2000);
        model.Change = change;
        IReadOnlyDictionary<string, CheckState>? states = null;
        for (int run = 0; run < runs; run++)
        {
            DateTimeOffset end = Start.AddHours(run + 1);
            IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, model.Window(baseline, rows, seed: 100 + run), Start.AddHours(run), end, states, newestRowTime: end);
            states = results.ToDictionary(r => r.Check, r => r.State, StringComparer.Ordinal);
            foreach (CheckResult r in results)
            {
                yield return r;
            }
        }
    }
}
