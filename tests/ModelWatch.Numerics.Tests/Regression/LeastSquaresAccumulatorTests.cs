using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Regression;

public sealed class LeastSquaresAccumulatorTests
{
    private const double Agreement = 1e-12;

    [Fact]
    public void Random_block_sizes_one_block_and_row_at_a_time_give_the_same_fit()
    {
        var data = new RandomDesign(rows: 20_000, features: 8, seed: 11);
        FitSummary oneBlock = Fit(data, blockRows: data.Rows, chunkSeed: null);
        FitSummary rowAtATime = Fit(data, blockRows: 1, chunkSeed: null);
        FitSummary randomChunks = Fit(data, blockRows: 97, chunkSeed: 5);

        AssertSameFit(oneBlock, rowAtATime);
        AssertSameFit(oneBlock, randomChunks);
    }

    [Fact]
    public void Merged_partitions_equal_a_single_pass()
    {
        var data = new RandomDesign(rows: 12_345, features: 6, seed: 12);
        FitSummary single = Fit(data, LeastSquaresAccumulator.DefaultBlockRows, chunkSeed: null);

        // Four disjoint partitions of uneven size, merged as a reduction tree ((a+b)+(c+d)).
        int[] cuts = [0, 1000, 1001, 7000, data.Rows];
        var parts = new LeastSquaresAccumulator[4];
        for (int part = 0; part < 4; part++)
        {
            parts[part] = new LeastSquaresAccumulator(data.Layout);
            parts[part].AddRows(data.RowMajor(cuts[part], cuts[part + 1] - cuts[part]));
        }

        parts[0].Merge(parts[1]);
        parts[2].Merge(parts[3]);
        parts[0].Merge(parts[2]);
        FitSummary merged = LeastSquaresFit.Fit(parts[0].ToFactor());

        Assert.Equal(data.Rows, merged.RowCount);
        AssertSameFit(single, merged);
        Assert.Equal(data.Outcome.Min(), parts[0].Columns[^1].Minimum);
        Assert.Equal(data.Outcome.Max(), parts[0].Columns[^1].Maximum);
        Assert.Equal(data.Rows, parts[0].Columns[0].Count);
    }

    [Fact]
    public void Merging_a_stored_factor_equals_reading_its_rows()
    {
        var data = new RandomDesign(rows: 3000, features: 4, seed: 13);
        var first = new LeastSquaresAccumulator(data.Layout);
        first.AddRows(data.RowMajor(0, 1000));
        AugmentedFactor stored = AugmentedFactor.FromRowMajor(data.Layout, first.RowCount, first.ToFactor().ToRowMajor());
        var second = new LeastSquaresAccumulator(data.Layout);
        second.AddRows(data.RowMajor(1000, 2000));
        second.Merge(stored);

        AssertSameFit(Fit(data, 256, null), LeastSquaresFit.Fit(second.ToFactor()));
    }

    [Fact]
    public void Factor_rows_are_sign_normalised()
    {
        var data = new RandomDesign(rows: 500, features: 3, seed: 14);
        AugmentedFactor factor = Accumulate(data, 64, null);

        for (int i = 0; i < factor.Width; i++)
        {
            Assert.True(factor[i, i] >= 0.0);
        }
    }

    [Fact]
    public void Non_finite_value_under_fail_policy_names_the_column_and_row()
    {
        var accumulator = new LeastSquaresAccumulator(new DesignLayout(["route_km", "stops"], "minutes", intercept: true));
        accumulator.AddRow([1.0, 2.0], 3.0);

        var error = Assert.Throws<NonFiniteValueException>(() => accumulator.AddRow([double.NaN, 2.0], 3.0));

        Assert.Equal("route_km", error.Column);
        Assert.Equal(2, error.Row);
        Assert.Contains("route_km", error.Message, StringComparison.Ordinal);
        Assert.Equal(1, accumulator.RowCount);
    }

    [Fact]
    public void Non_finite_values_under_reject_policy_are_counted_never_folded_in()
    {
        var layout = new DesignLayout(["route_km"], "minutes", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.RejectRow);
        Assert.True(accumulator.AddRow([1.0], 2.0));
        Assert.True(accumulator.AddRow([2.0], 4.5));
        Assert.False(accumulator.AddRow([3.0], double.PositiveInfinity));
        Assert.False(accumulator.AddRow([double.NaN], 1.0));
        Assert.True(accumulator.AddRow([3.0], 5.5));

        Assert.Equal(3, accumulator.RowCount);
        Assert.Equal(2, accumulator.RejectedRowCount);
        Assert.Equal(1, accumulator.Columns[0].NonFiniteCount);
        Assert.Equal(1, accumulator.Columns[1].NonFiniteCount);

        // The fit sees only the three finite rows: y = 2 + ... exactly through (1,2), (2,4.5), (3,5.5) by least squares.
        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
        Assert.Equal(1.75, fit.Coefficients[1].Estimate!.Value, 12); // slope = Sxy/Sxx = 3.5/2, exact
        Assert.Equal(0.5, fit.Coefficients[0].Estimate!.Value, 12);  // intercept = 4 − 1.75·2, exact
    }

    [Fact]
    public void Accumulators_of_different_designs_do_not_merge()
    {
        var a = new LeastSquaresAccumulator(new DesignLayout(["x1"], "y", intercept: true));
        var b = new LeastSquaresAccumulator(new DesignLayout(["x2"], "y", intercept: true));

        Assert.Throws<ArgumentException>(() => a.Merge(b));
    }

    [Fact]
    public void Memory_does_not_grow_with_rows()
    {
        var data = new RandomDesign(rows: 1000, features: 5, seed: 15);
        var accumulator = new LeastSquaresAccumulator(data.Layout);
        double[] block = data.RowMajor(0, data.Rows);
        accumulator.AddRows(block);

        long before = GC.GetAllocatedBytesForCurrentThread();
        for (int repeat = 0; repeat < 50; repeat++)
        {
            accumulator.AddRows(block);
        }

        long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Equal(51_000, accumulator.RowCount);
        Assert.Equal(0, allocated);
    }

    private static AugmentedFactor Accumulate(RandomDesign data, int blockRows, int? chunkSeed)
    {
        var accumulator = new LeastSquaresAccumulator(data.Layout, NonFiniteValuePolicy.Fail, blockRows);
        if (chunkSeed is null)
        {
            accumulator.AddRows(data.RowMajor(0, data.Rows));
        }
        else
        {
            var random = new Random(chunkSeed.Value);
            for (int from = 0; from < data.Rows;)
            {
                int count = Math.Min(random.Next(1, 700), data.Rows - from);
                accumulator.AddRows(data.RowMajor(from, count));
                from += count;
            }
        }

        return accumulator.ToFactor();
    }

    private static FitSummary Fit(RandomDesign data, int blockRows, int? chunkSeed) =>
        LeastSquaresFit.Fit(Accumulate(data, blockRows, chunkSeed));

    private static void AssertSameFit(FitSummary expected, FitSummary actual)
    {
        Assert.Equal(expected.RowCount, actual.RowCount);
        for (int j = 0; j < expected.ParameterCount; j++)
        {
            AssertRelative(expected.Coefficients[j].Estimate!.Value, actual.Coefficients[j].Estimate!.Value);
            AssertRelative(expected.Coefficients[j].StandardError!.Value, actual.Coefficients[j].StandardError!.Value);
        }

        AssertRelative(expected.ResidualSumOfSquares, actual.ResidualSumOfSquares);
        for (int i = 0; i < expected.Factor.Width; i++)
        {
            for (int j = i; j < expected.Factor.Width; j++)
            {
                double scale = Math.Max(Math.Abs(expected.Factor[i, i]), Math.Abs(expected.Factor[j, j]));
                Assert.True(Math.Abs(expected.Factor[i, j] - actual.Factor[i, j]) <= Agreement * scale, $"T[{i},{j}]");
            }
        }
    }

    private static void AssertRelative(double expected, double actual) =>
        Assert.True(Math.Abs(expected - actual) <= Agreement * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");
}
