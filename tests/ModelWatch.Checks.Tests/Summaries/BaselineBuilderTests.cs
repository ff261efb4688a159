using System.Text.Json;
using ModelWatch.Checks.Summaries;
using ModelWatch.Calibration;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Tests.Summaries;

public sealed class BaselineBuilderTests
{
    [Fact]
    public void Fitted_baseline_carries_the_fit_of_its_rows()
    {
        var model = new SyntheticModel(seed: 1);
        var builder = new BaselineBuilder(model.Layout, new BaselineBuilderOptions { Seed = 3 });
        var accumulator = new LeastSquaresAccumulator(model.Layout);
        for (int i = 0; i < 3000; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow(x, y);
            accumulator.AddRow(x, y);
        }

        BaselineReference baseline = builder.Build(BaselineOrigin.Fitted);
        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
        Assert.Equal(BaselineOrigin.Fitted, baseline.Origin);
        Assert.Equal(3000, baseline.RowCount);
        Assert.Equal(fit.ResidualStandardDeviation, baseline.ResidualStandardDeviation, 12);
        double[] b = baseline.CoefficientVector();
        for (int j = 0; j < b.Length; j++)
        {
            Assert.Equal(fit.Coefficients[j].Estimate!.Value, b[j], 12);
            Assert.Equal(fit.Covariance[j, j], baseline.Covariance![j][j], 14);
        }

        Assert.Equal(3000, baseline.SampleSize);
        Assert.Equal(3000, baseline.ResidualSample.Count);
        Assert.All(baseline.FeatureBins, bins =>
        {
            Assert.Equal(9, bins.Edges.Length);
            Assert.Equal(1.0, bins.Proportions.Sum(), 12);
            Assert.All(bins.Proportions, pr => Assert.InRange(pr, 0.099, 0.101));
        });

        // By construction about 1 % of the reference rows lie above the 99th-percentile leverage.
        Assert.InRange(baseline.LeverageExceedanceShare!.Value, 0.009, 0.011);

        // Studentized residuals of a correct model have unit variance.
        double variance = baseline.ResidualSample.Sum(r => r * r) / baseline.ResidualSample.Count;
        Assert.InRange(variance, 0.93, 1.07);
    }

    [Fact]
    public void Reservoir_is_bounded_and_reproducible_for_a_seed()
    {
        BaselineReference Build()
        {
            var model = new SyntheticModel(seed: 2, features: 2);
            var builder = new BaselineBuilder(model.Layout, new BaselineBuilderOptions { Seed = 5, ReservoirSize = 500 });
            for (int i = 0; i < 4000; i++)
            {
                (double[] x, double y) = model.Row();
                builder.AddRow(x, y);
            }

            return builder.Build(BaselineOrigin.Fitted);
        }

        BaselineReference a = Build();
        BaselineReference b = Build();
        Assert.Equal(500, a.SampleSize);
        Assert.Equal(a.ResidualSample, b.ResidualSample);
        Assert.Equal(a.Fingerprint, b.Fingerprint);
    }

    [Fact]
    public void Baseline_round_trips_through_System_Text_Json()
    {
        var model = new SyntheticModel(seed: 4, features: 3);
        BaselineReference baseline = model.Baseline(600);
        string json = JsonSerializer.Serialize(baseline);
        Assert.Contains("\"Origin\":\"fitted\"", json, StringComparison.Ordinal);
        BaselineReference back = JsonSerializer.Deserialize<BaselineReference>(json)!;
        Assert.Equal(baseline.Fingerprint, back.Fingerprint);
        Assert.Equal(baseline.CoefficientVector(), back.CoefficientVector());
        Assert.Equal(baseline.ResidualSample, back.ResidualSample);
        Assert.Equal(baseline.FeatureBins[1].Edges, back.FeatureBins[1].Edges);
        Assert.Equal(baseline.ToFactor()!.ToRowMajor(), back.ToFactor()!.ToRowMajor());
        Assert.Equal(baseline.LeverageThreshold, back.LeverageThreshold);
    }

    [Fact]
    public void Imported_baseline_without_covariance_keeps_it_null_and_estimates_spread_from_the_rows()
    {
        var model = new SyntheticModel(seed: 6, features: 2);
        var builder = new BaselineBuilder(model.Layout, new BaselineBuilderOptions());
        for (int i = 0; i < 1000; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow(x, y);
        }

        var imported = new ImportedCoefficients
        {
            Coefficients = new Dictionary<string, double> { ["(intercept)"] = 2.0, ["x1"] = 0.75, ["x2"] = 1.0 },
        };
        BaselineReference baseline = builder.Build(BaselineOrigin.Imported, imported);
        Assert.Null(baseline.Covariance);
        Assert.Null(baseline.StandardErrors);
        Assert.Equal([2.0, 0.75, 1.0], baseline.CoefficientVector());

        // The true coefficients on their own data: the spread estimate is close to σ = 1.
        Assert.InRange(baseline.ResidualStandardDeviation, 0.93, 1.07);
    }

    [Fact]
    public void Imported_coefficients_missing_a_term_are_refused_with_the_term_named()
    {
        var model = new SyntheticModel(seed: 6, features: 2);
        var builder = new BaselineBuilder(model.Layout, new BaselineBuilderOptions());
        var imported = new ImportedCoefficients
        {
            Coefficients = new Dictionary<string, double> { ["(intercept)"] = 2.0, ["x1"] = 0.75 },
            ResidualStandardDeviation = 1.0,
        };
        var error = Assert.Throws<ArgumentException>(() => builder.Build(BaselineOrigin.Imported, imported));
        Assert.Contains("'x2'", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Fitted_baseline_on_a_constant_feature_names_the_column()
    {
        var layout = new DesignLayout(["a", "b"], "y", intercept: true);
        var builder = new BaselineBuilder(layout, new BaselineBuilderOptions());
        var random = new Random(1);
        for (int i = 0; i < 100; i++)
        {
            builder.AddRow([random.NextDouble(), 3.0], random.NextDouble());
        }

        var error = Assert.Throws<InvalidOperationException>(() => builder.Build(BaselineOrigin.Fitted));
        Assert.Contains("'b'", error.Message, StringComparison.Ordinal);
    }
}
