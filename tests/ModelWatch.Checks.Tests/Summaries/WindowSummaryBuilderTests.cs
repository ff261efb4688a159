using ModelWatch.Checks.Summaries;
using ModelWatch.Calibration;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Tests.Summaries;

public sealed class WindowSummaryBuilderTests
{
    [Fact]
    public void Single_pass_statistics_match_direct_computation()
    {
        var model = new SyntheticModel(seed: 10, features: 3);
        BaselineReference baseline = model.Baseline(1000);
        double[] b0 = baseline.CoefficientVector();
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        var errors = new List<double>();
        for (int i = 0; i < 400; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow(x, y, servedPrediction: b0[0] + x.Select((v, j) => v * b0[j + 1]).Sum());
            errors.Add(y - b0[0] - x.Select((v, j) => v * b0[j + 1]).Sum());
        }

        WindowSummary window = builder.Build();
        Assert.Equal(400, window.RowsAccepted);
        Assert.Equal(errors.Sum(), window.DeployedErrorSum, 9);
        Assert.Equal(errors.Sum(e => e * e), window.DeployedErrorSumOfSquares, 9);
        double[] direct = Autocorrelation.Coefficients(errors, 10);
        for (int k = 0; k < 10; k++)
        {
            Assert.Equal(direct[k], window.Autocorrelations[k], 12);
        }

        double mean = errors.Average();
        Assert.Equal(Autocorrelation.DurbinWatson(errors.Select(e => e - mean).ToArray()), window.DurbinWatson, 12);
        Assert.Equal(400, window.ServedCount);
        Assert.Equal(0, window.ServedMismatchCount);
        Assert.Equal(400, window.FeatureBinCounts[0].Sum());
        Assert.Equal(400, window.SampleSize);
        Assert.Equal(400, window.NewRows!.RowCount);
    }

    [Fact]
    public void Merged_sub_ranges_equal_one_pass_exactly_except_the_reservoir()
    {
        var model = new SyntheticModel(seed: 12, features: 2);
        BaselineReference baseline = model.Baseline(800);
        var rows = Enumerable.Range(0, 900).Select(_ => model.Row()).ToList();
        var whole = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions { ReservoirSize = 300 });
        var first = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions { ReservoirSize = 300 });
        var second = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions { ReservoirSize = 300, Seed = 2 });
        for (int i = 0; i < rows.Count; i++)
        {
            whole.AddRow(rows[i].X, rows[i].Y);
            (i < 377 ? first : second).AddRow(rows[i].X, rows[i].Y);
        }

        first.Merge(second);
        WindowSummary a = whole.Build();
        WindowSummary b = first.Build();
        Assert.Equal(a.RowsAccepted, b.RowsAccepted);
        Assert.Equal(a.DeployedErrorSumOfSquares, b.DeployedErrorSumOfSquares, 9);
        for (int k = 0; k < a.Autocorrelations.Length; k++)
        {
            Assert.Equal(a.Autocorrelations[k], b.Autocorrelations[k], 11);
        }

        Assert.Equal(a.DurbinWatson, b.DurbinWatson, 11);
        Assert.Equal(a.FeatureBinCounts[1], b.FeatureBinCounts[1]);
        Assert.Equal(a.LeverageExceedanceCount, b.LeverageExceedanceCount);
        double[] ca = a.Fit!.Coefficients.Select(c => c.Estimate!.Value).ToArray();
        double[] cb = b.Fit!.Coefficients.Select(c => c.Estimate!.Value).ToArray();
        for (int j = 0; j < ca.Length; j++)
        {
            Assert.Equal(ca[j], cb[j], 11);
        }

        Assert.Equal(300, b.SampleSize);
    }

    [Fact]
    public void Rows_already_seen_are_left_out_of_the_new_rows_factor()
    {
        var model = new SyntheticModel(seed: 13, features: 2);
        BaselineReference baseline = model.Baseline(500);
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < 100; i++)
        {
            (double[] x, double y) = model.Row();
            builder.AddRow(x, y, null, newSinceLastRun: i >= 70);
        }

        WindowSummary window = builder.Build();
        Assert.Equal(100, window.RowsAccepted);
        Assert.Equal(30, window.NewRows!.RowCount);
    }

    [Theory]
    [InlineData(0, 60, 100)]
    [InlineData(30, 100, 100)]
    [InlineData(45, 0, 100)]
    [InlineData(80, 50, 50)]
    public void The_new_rows_factor_holds_exactly_the_new_rows_however_the_window_is_split(int split, int firstNew, int lastNew)
    {
        // Rows firstNew ≤ i < lastNew are new; the window is read as [0, split) and [split, 100), merged in order.
        var model = new SyntheticModel(seed: 14, features: 2);
        BaselineReference baseline = model.Baseline(500);
        var rows = Enumerable.Range(0, 100).Select(_ => model.Row()).ToList();
        var expected = new LeastSquaresAccumulator(model.Layout);
        var first = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        var second = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        for (int i = 0; i < rows.Count; i++)
        {
            bool isNew = i >= firstNew && i < lastNew;
            (i < split ? first : second).AddRow(rows[i].X, rows[i].Y, null, isNew);
            if (isNew)
            {
                expected.AddRow(rows[i].X, rows[i].Y);
            }
        }

        first.Merge(second);
        WindowSummary window = first.Build();
        Assert.Equal(100, window.RowsAccepted);
        if (expected.RowCount == 0)
        {
            Assert.Null(window.NewRows);
            return;
        }

        AugmentedFactor reference = expected.ToFactor();
        Assert.Equal(reference.RowCount, window.NewRows!.RowCount);
        Assert.Equal(reference.ResidualSumOfSquares, window.NewRows.ResidualSumOfSquares, 1e-9 * reference.ResidualSumOfSquares);
        FitSummary a = LeastSquaresFit.Fit(reference);
        FitSummary b = LeastSquaresFit.Fit(window.NewRows);
        for (int j = 0; j < a.ParameterCount; j++)
        {
            Assert.Equal(a.Coefficients[j].Estimate!.Value, b.Coefficients[j].Estimate!.Value, 10);
        }
    }

    [Fact]
    public void Non_finite_rows_are_counted_by_column_and_a_mismatched_design_is_refused()
    {
        var model = new SyntheticModel(seed: 14, features: 2);
        BaselineReference baseline = model.Baseline(500);
        var builder = new WindowSummaryBuilder(model.Layout, baseline, new WindowSummaryOptions());
        Assert.True(builder.AddRow([1.0, 2.0], 3.0));
        Assert.False(builder.AddRow([double.NaN, 2.0], 3.0));
        WindowSummary window = builder.Build();
        Assert.Equal(1, window.RowsRejected);
        Assert.Equal(1, window.NonFiniteByColumn["x1"]);

        var other = new DesignLayout(["x1", "x3"], "y", intercept: true);
        var error = Assert.Throws<ArgumentException>(() => new WindowSummaryBuilder(other, baseline, new WindowSummaryOptions()));
        Assert.Contains("x3", error.Message, StringComparison.Ordinal);
    }
}
