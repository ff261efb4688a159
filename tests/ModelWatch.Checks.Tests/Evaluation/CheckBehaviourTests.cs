using System.Text.Json;
using ModelWatch.Checks.Coefficients;
using ModelWatch.Checks.Collinearity;
using ModelWatch.Checks.Data;
using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;
using ModelWatch.Checks.PredictionError;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Sequential;
using ModelWatch.Checks.Serving;
using ModelWatch.Checks.Summaries;
using ModelWatch.Calibration;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Tests.Evaluation;

public sealed class CheckBehaviourTests
{
    private static readonly DateTimeOffset Start = new(2026, 1, 1, 0, 0, 0, TimeSpan.Zero);
    private static readonly JsonSerializerOptions SnakeCase = new() { PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower };

    [Fact]
    public void Too_few_rows_skip_every_check_of_the_window_with_insufficient_data()
    {
        var model = new SyntheticModel(seed: 21, features: 3);
        BaselineReference baseline = model.Baseline(800);
        WindowSummary window = model.Window(baseline, 12);
        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, window, Start, Start.AddHours(1), null);
        Assert.Equal(CheckNames.All.OrderBy(c => c, StringComparer.Ordinal), results.Select(r => r.Check).OrderBy(c => c, StringComparer.Ordinal));

        // The source check judges the run itself (it read its window), never the rows.
        Assert.False(results.Single(r => r.Check == CheckNames.Source).Skipped);
        Assert.All(results.Where(r => r.Check != CheckNames.Source), r =>
        {
            Assert.True(r.Skipped);
            Assert.Equal(SkipReasons.InsufficientData, r.SkipReason);
        });
    }

    [Fact]
    public void A_null_window_gives_no_critical_finding_and_serialises_to_json()
    {
        var model = new SyntheticModel(seed: 22, features: 5);
        BaselineReference baseline = model.Baseline(2000);
        WindowSummary window = model.Window(baseline, 500);
        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, window, Start, Start.AddHours(24), null);
        Assert.DoesNotContain(results.SelectMany(r => r.Findings), f => f.Severity == Severity.Critical);
        Assert.All(results.Where(r => r.Check != CheckNames.Serving), r => Assert.False(r.Skipped));
        string json = JsonSerializer.Serialize(results);
        Assert.Contains("\"Severity\":\"ok\"", json, StringComparison.Ordinal);
        var states = results.ToDictionary(r => r.Check, r => JsonSerializer.Deserialize<CheckState>(JsonSerializer.Serialize(r.State))!);
        Assert.Equal(2500, states[CheckNames.Residuals].Read<ResidualsState>().Running!.Count);
    }

    [Fact]
    public void Imported_baseline_without_covariance_skips_Wald_with_a_reason()
    {
        var model = new SyntheticModel(seed: 23, features: 2);
        var builder = new BaselineBuilder(model.Layout, new BaselineBuilderOptions());
        var imported = new ImportedCoefficients
        {
            Coefficients = new Dictionary<string, double> { ["(intercept)"] = 2.0, ["x1"] = 0.75, ["x2"] = 1.0 },
            ResidualStandardDeviation = 1.0,
            RowCount = 5000,
        };
        BaselineReference baseline = builder.Build(BaselineOrigin.Imported, imported);
        WindowSummary window = model.Window(baseline, 300);
        CheckResult result = CoefficientsCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = window, WindowStart = Start, WindowEnd = Start.AddDays(1) });
        Finding wald = result.Findings.Single(f => f.Statistic == "wald");
        Assert.True(wald.Skipped);
        Assert.Equal(SkipReasons.BaselineIncomplete, wald.SkipReason);
        Assert.Contains("covariance", wald.Explanation, StringComparison.Ordinal);
    }

    [Fact]
    public void An_imported_baseline_stored_alone_round_trips_and_every_test_it_cannot_support_is_skipped()
    {
        var model = new SyntheticModel(seed: 30, features: 2);
        var imported = new ImportedCoefficients
        {
            Coefficients = new Dictionary<string, double> { ["(intercept)"] = 2.0, ["x1"] = 0.75, ["x2"] = 1.0 },
            StandardErrors = new Dictionary<string, double> { ["(intercept)"] = 0.01, ["x1"] = 0.01, ["x2"] = 0.01 },
            ResidualStandardDeviation = 1.0,
            RowCount = 10_000,
        };
        BaselineReference stored = new BaselineBuilder(model.Layout, new BaselineBuilderOptions()).Build(BaselineOrigin.Imported, imported);
        BaselineReference baseline = JsonSerializer.Deserialize<BaselineReference>(JsonSerializer.Serialize(stored))!;
        Assert.Null(baseline.Factor);
        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, model.Window(baseline, 400), Start, Start.AddDays(1), null);
        var skipped = results.SelectMany(r => r.Findings).Where(f => f.Skipped).Select(f => f.Check + "/" + f.Statistic).ToHashSet();
        foreach (string expected in new[] { "coefficients/wald", "coefficients/chow", "residuals/cusum", "residuals/bias_t", "residuals/brown_forsythe", "residuals/variance_ratio", "residuals/ks", "features/psi", "features/ks", "features/leverage_exceedance" })
        {
            Assert.Contains(expected, skipped);
        }

        // Standard errors alone still support the per-coefficient tests, and the error metrics need only b0 and s_ref.
        Assert.Contains(results.Single(r => r.Check == CheckNames.Coefficients).Findings, f => f.Statistic == "z" && !f.Skipped);
        Assert.False(results.Single(r => r.Check == CheckNames.Error).Findings.Single().Skipped);
        Assert.NotNull(JsonSerializer.Serialize(results));
    }

    [Fact]
    public void Overlapping_windows_are_tested_on_every_run()
    {
        var model = new SyntheticModel(seed: 24, features: 2);
        BaselineReference baseline = model.Baseline(1000);
        var input = new CheckInput { Baseline = baseline, Window = model.Window(baseline, 300), WindowStart = Start, WindowEnd = Start.AddHours(24) };
        CheckResult first = CoefficientsCheck.Instance.Run(input);
        CheckResult second = CoefficientsCheck.Instance.Run(input with { State = first.State, WindowStart = Start.AddHours(1), WindowEnd = Start.AddHours(25) });
        foreach (CheckResult result in new[] { first, second })
        {
            Assert.False(result.Findings.Single(f => f.Statistic == "wald").Skipped);
            Assert.Contains(result.Findings, f => f.Statistic == "moving_estimates" && !f.Skipped);
            Assert.Contains(result.Findings, f => f.Statistic == "ols_mosum" && !f.Skipped);
        }
    }

    [Fact]
    public void A_new_baseline_starts_the_sequential_state_afresh()
    {
        var model = new SyntheticModel(seed: 25, features: 2);
        BaselineReference first = model.Baseline(1000, seed: 1);
        BaselineReference second = model.Baseline(1000, seed: 2);
        CheckState stale = CheckState.For(first.Fingerprint).With(new ResidualsState { Bias = new CusumSums { Upper = 7.0 } });
        var input = new CheckInput { Baseline = second, Window = model.Window(second, 200), WindowStart = Start, WindowEnd = Start.AddHours(1), State = stale };
        CheckResult result = ResidualsCheck.Instance.Run(input);
        Assert.Equal(second.Fingerprint, result.State.BaselineFingerprint);
        ResidualsState memory = result.State.Read<ResidualsState>();
        Assert.Equal(1200, memory.Running!.Count);
        Assert.True(memory.Bias.Upper < 7.0);
    }

    [Fact]
    public void A_state_stored_by_the_version_before_every_run_was_tested_starts_afresh()
    {
        var model = new SyntheticModel(seed: 34, features: 2);
        BaselineReference baseline = model.Baseline(1000);

        // What that version stored for the residuals check (snake_case, as the daemon writes state documents).
        string stored = "{\"schema_version\":1,\"baseline_fingerprint\":\"" + baseline.Fingerprint + "\",\"cusum_upper\":9.5,\"cusum_runs\":40,\"sequential_row_count\":99999}";
        CheckState old = JsonSerializer.Deserialize<CheckState>(stored, SnakeCase)!;
        CheckResult result = ResidualsCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = model.Window(baseline, 200), WindowStart = Start, WindowEnd = Start.AddHours(1), State = old });

        Assert.Equal(CheckState.CurrentSchemaVersion, result.State.SchemaVersion);
        Assert.Equal(1200, result.State.Read<ResidualsState>().Running!.Count);
        Assert.True(result.State.Read<ResidualsState>().Bias.Upper < 9.5);
    }

    [Fact]
    public void The_CUSUM_refuses_an_overlapping_window_whose_rows_were_all_marked_new()
    {
        var model = new SyntheticModel(seed: 33, features: 2);
        BaselineReference baseline = model.Baseline(1000);
        WindowSummary window = model.Window(baseline, 200);
        IReadOnlyList<CheckResult> firstRun = ModelChecks.Run(baseline, window, Start, Start.AddHours(24), null);
        CheckResult first = firstRun.Single(r => r.Check == CheckNames.Residuals);
        CheckResult second = ModelChecks.Run(baseline, window, Start.AddHours(1), Start.AddHours(25), firstRun.ToDictionary(r => r.Check, r => r.State)).Single(r => r.Check == CheckNames.Residuals);
        Finding cusum = second.Findings.Single(f => f.Statistic == "cusum");
        Assert.Equal(SkipReasons.RowsNotMarked, cusum.SkipReason);
        Assert.Equal(first.State.Read<ResidualsState>().Running!.Count, second.State.Read<ResidualsState>().Running!.Count);
    }

    [Fact]
    public void A_quiet_source_becomes_critical_after_the_configured_runs()
    {
        var model = new SyntheticModel(seed: 26, features: 2);
        BaselineReference baseline = model.Baseline(500);
        WindowSummary empty = model.Window(baseline, 0);
        CheckState? state = null;
        var severities = new List<Severity>();
        for (int run = 0; run < 3; run++)
        {
            CheckResult result = DataCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = empty, WindowStart = Start, WindowEnd = Start.AddHours(1), State = state });
            state = result.State;
            severities.Add(result.Findings.Single(f => f.Statistic == "quiet_source").Severity);
            Assert.True(result.Skipped);
        }

        Assert.Equal([Severity.Warning, Severity.Warning, Severity.Critical], severities);
    }

    [Fact]
    public void Served_predictions_from_stale_coefficients_are_critical()
    {
        var model = new SyntheticModel(seed: 27, features: 2);
        BaselineReference baseline = model.Baseline(500);
        double[] b0 = baseline.CoefficientVector();
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < 200; i++)
        {
            (double[] x, double y) = model.Row();
            double stale = b0[0] + (b0[1] * x[0] * 0.9) + (b0[2] * x[1]);
            builder.AddRow(x, y, stale);
        }

        CheckResult result = ServingCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = builder.Build(), WindowStart = Start, WindowEnd = Start.AddHours(1) });
        Finding f = Assert.Single(result.Findings);
        Assert.Equal(Severity.Critical, f.Severity);
        Assert.Contains("stale coefficient file", f.Explanation, StringComparison.Ordinal);
    }

    [Fact]
    public void A_constant_feature_is_critical_in_data_and_lost_rank_names_the_column()
    {
        var model = new SyntheticModel(seed: 28, features: 2);
        BaselineReference baseline = model.Baseline(500);
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < 200; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow([x[0], 4.0], y);
        }

        WindowSummary window = builder.Build();
        var input = new CheckInput { Baseline = baseline, Window = window, WindowStart = Start, WindowEnd = Start.AddHours(1) };
        Finding constant = DataCheck.Instance.Run(input).Findings.Single(f => f.Statistic == "constant_feature");
        Assert.Equal("x2", constant.Subject);
        Assert.Equal(Severity.Critical, constant.Severity);
        Finding rank = Assert.Single(CollinearityCheck.Instance.Run(input).Findings);
        Assert.Equal("x2", rank.Subject);
        Assert.Equal(Severity.Critical, rank.Severity);
        Assert.False(rank.RequiresPersistence);
    }

    [Fact]
    public void An_exactly_collinear_window_runs_every_check_without_failing_and_names_the_aliased_column()
    {
        var model = new SyntheticModel(seed: 32, features: 3);
        BaselineReference baseline = model.Baseline(1000);
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < 300; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow([x[0], x[1], 2.0 * x[0]], y);
        }

        IReadOnlyList<CheckResult> results = ModelChecks.Run(baseline, builder.Build(), Start, Start.AddHours(24), null);
        Finding rank = results.Single(r => r.Check == CheckNames.Collinearity).Findings.Single();
        Assert.Equal("x3", rank.Subject);
        Assert.Equal(Severity.Critical, rank.Severity);
        Assert.Equal(SkipReasons.RankDeficient, results.Single(r => r.Check == CheckNames.Coefficients).Findings.Single(f => f.Statistic == "wald").SkipReason);
        Assert.NotNull(JsonSerializer.Serialize(results));
    }

    [Fact]
    public void Serially_correlated_errors_in_a_small_window_warn_through_the_Durbin_Watson_bounds()
    {
        var model = new SyntheticModel(seed: 29, features: 2);
        BaselineReference baseline = model.Baseline(1000);
        double[] b0 = baseline.CoefficientVector();
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        double noise = 0.0;
        for (int i = 0; i < 80; i++)
        {
            (double[] x, _) = model.Row();
            noise = (0.8 * noise) + (0.6 * model.Normal());
            builder.AddRow(x, b0[0] + (b0[1] * x[0]) + (b0[2] * x[1]) + noise);
        }

        CheckResult result = ResidualsCheck.Instance.Run(new CheckInput { Baseline = baseline, Window = builder.Build(), WindowStart = Start, WindowEnd = Start.AddHours(1) });
        Finding dw = result.Findings.Single(f => f.Statistic == "durbin_watson");
        Assert.InRange(dw.Value!.Value, 0.0, 1.0);
        Assert.Equal(Severity.Warning, dw.Severity);
        Assert.True(dw.Details.GetValueOrDefault("p_value_liberal") <= dw.PValue!.Value + 1e-6);
    }

    [Fact]
    public void Decomposition_identity_holds_to_1e_10_on_random_data()
    {
        var random = new Random(31);
        for (int trial = 0; trial < 20; trial++)
        {
            var model = new SyntheticModel(seed: 100 + trial, features: 1 + (trial % 6));
            BaselineReference baseline = model.Baseline(300 + (37 * trial));
            model.Change = new Shift { CoefficientFeature = trial % model.FeatureCount, CoefficientChange = random.NextDouble() - 0.5, Bias = random.NextDouble() - 0.5, VarianceFactor = 0.5 + random.NextDouble() };
            double[] b0 = baseline.CoefficientVector();
            var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
            double direct = 0.0;
            int m = 50 + (23 * trial);
            for (int i = 0; i < m; i++)
            {
                (double[] x, double y) = model.Row();
                builder.AddRow(x, y);
                double e = y - b0[0] - x.Select((v, j) => v * b0[j + 1]).Sum();
                direct += e * e;
            }

            ErrorDecomposition parts = ErrorCheck.Decompose(baseline, builder.Build())!;
            double mse = direct / m;
            Assert.Equal(0.0, (parts.RefitMse + parts.BiasSquared + parts.SlopeDrift - mse) / mse, 10);
            Assert.Equal(0.0, (parts.DeployedMse - mse) / mse, 10);
            Assert.True(parts.SlopeDrift >= -1e-12 * mse);
        }
    }
}
