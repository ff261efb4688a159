using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Store.Windows;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Store.Tests.Windows;

public sealed class WindowReaderTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private const int Rows = 2_000;
    private static readonly DateTimeOffset End = StoreTestData.Start.AddMinutes(Rows);

    public async Task InitializeAsync()
    {
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, Rows);
        await using NpgsqlCommand single = database.DataSource.CreateCommand(
            "CREATE TABLE IF NOT EXISTS one_feature AS SELECT at, distance_km, minutes FROM deliveries");
        await single.ExecuteNonQueryAsync();
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task The_refit_equals_the_same_fold_over_rows_fetched_directly()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("courier-direct"));

        var read = await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None);

        var direct = new LeastSquaresAccumulator(spec.Layout);
        await using (NpgsqlCommand command = database.DataSource.CreateCommand("SELECT distance_km, stops, load_kg, minutes FROM deliveries ORDER BY at"))
        await using (NpgsqlDataReader rows = await command.ExecuteReaderAsync())
        {
            var x = new double[3];
            while (await rows.ReadAsync())
            {
                x[0] = rows.GetDouble(0);
                x[1] = rows.GetInt32(1);
                x[2] = (double)rows.GetDecimal(2);
                direct.AddRow(x, rows.GetDouble(3));
            }
        }

        Assert.Equal(Rows, read.RowsRead);
        Assert.Equal(0, read.RowsRejected);
        AugmentedFactor expected = direct.ToFactor();
        AugmentedFactor actual = read.Sink.Accumulator.ToFactor();
        Assert.Equal(expected.RowCount, actual.RowCount);
        for (int i = 0; i < expected.Width; i++)
        {
            for (int j = i; j < expected.Width; j++)
            {
                // numeric(8,2) → float8 is exact to the nearest double on both paths, so the folds see identical rows.
                Assert.Equal(expected[i, j], actual[i, j]);
            }
        }
    }

    [Fact]
    public async Task A_one_feature_refit_matches_postgresql_regr_slope_and_regr_intercept()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml(
            "courier-simple", "SELECT * FROM one_feature WHERE at >= @window_start AND at < @window_end", "[distance_km]"));

        var read = await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None);
        FitSummary fit = LeastSquaresFit.Fit(read.Sink.Accumulator.ToFactor());

        // Outside reference: PostgreSQL's own aggregates (Youngs–Cramer sums, a different algorithm from Householder QR).
        await using NpgsqlCommand reference = database.DataSource.CreateCommand(
            "SELECT regr_intercept(minutes, distance_km), regr_slope(minutes, distance_km), regr_r2(minutes, distance_km) FROM one_feature");
        await using NpgsqlDataReader r = await reference.ExecuteReaderAsync();
        Assert.True(await r.ReadAsync());
        Assert.Equal(r.GetDouble(0), fit.Coefficients[0].Estimate!.Value, 1e-10);
        Assert.Equal(r.GetDouble(1), fit.Coefficients[1].Estimate!.Value, 1e-10);
        Assert.Equal(r.GetDouble(2), fit.RSquared, 1e-12);
    }

    [Fact]
    public async Task Parallel_sub_range_reads_merge_to_the_single_read()
    {
        ModelSpec single = StoreTestData.Spec(StoreTestData.Yaml("courier-single"));
        ModelSpec parallel = StoreTestData.Spec(StoreTestData.Yaml("courier-parallel", extra: "parallel_reads: 3"));
        var reader = new WindowReader();

        var one = await reader.ReadAsync(database.DataSource, single, StoreTestData.Start, End, () => new AccumulatorSink(single.Layout), AccumulatorSink.Merge, CancellationToken.None);
        var three = await reader.ReadAsync(database.DataSource, parallel, StoreTestData.Start, End, () => new AccumulatorSink(parallel.Layout), AccumulatorSink.Merge, CancellationToken.None);

        Assert.Equal(one.RowsRead, three.RowsRead);
        Assert.Equal(Rows, three.Sink.Accumulator.RowCount);
        FitSummary a = LeastSquaresFit.Fit(one.Sink.Accumulator.ToFactor());
        FitSummary b = LeastSquaresFit.Fit(three.Sink.Accumulator.ToFactor());
        for (int j = 0; j < a.ParameterCount; j++)
        {
            double expected = a.Coefficients[j].Estimate!.Value;
            Assert.Equal(expected, b.Coefficients[j].Estimate!.Value, Math.Abs(expected) * 1e-12);
        }

        Assert.Equal(a.ResidualSumOfSquares, b.ResidualSumOfSquares, a.ResidualSumOfSquares * 1e-12);
        Assert.Equal(one.Sink.Accumulator.Columns[0].Sum, three.Sink.Accumulator.Columns[0].Sum, 1e-9);
    }

    [Fact]
    public void Sub_ranges_tile_the_window_on_whole_microseconds()
    {
        DateTimeOffset start = StoreTestData.Start;
        DateTimeOffset end = start.AddSeconds(10);

        DateTimeOffset[] bounds = WindowReader.Split(start, end, 3);

        Assert.Equal([start, start.AddTicks(33_333_330), start.AddTicks(66_666_660), end], bounds);
    }

    [Fact]
    public async Task Rows_arrive_in_time_order_whatever_order_the_query_returns()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml(
            "courier-order", "SELECT * FROM deliveries WHERE at >= @window_start AND at < @window_end ORDER BY at DESC", "[distance_km]"));
        var sink = new OrderSink();

        await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, StoreTestData.Start.AddMinutes(50), () => sink, null, CancellationToken.None);

        // distance_km = (g % 97)/7 + 1 rises with the row number g over the first 50 minutes.
        Assert.Equal(50, sink.Values.Count);
        Assert.Equal(sink.Values.Order().ToList(), sink.Values);
    }

    [Fact]
    public async Task Rows_from_the_new_rows_time_on_are_marked_new_in_every_sub_range()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("courier-new-rows", extra: "parallel_reads: 3"));
        var sinks = new List<OrderSink>();

        // One row a minute: of the 60 minutes read, the last 15 are new since the previous run.
        await new WindowReader().ReadAsync(
            database.DataSource, spec, StoreTestData.Start, StoreTestData.Start.AddMinutes(60),
            () => { var sink = new OrderSink(); sinks.Add(sink); return sink; }, (_, _) => { },
            StoreTestData.Start.AddMinutes(45), CancellationToken.None);

        Assert.Equal(60, sinks.Sum(s => s.New.Count));
        Assert.Equal(15, sinks.Sum(s => s.New.Count(n => n)));
        Assert.All(sinks.SelectMany(s => s.New.SkipWhile(n => !n)), Assert.True);
    }

    [Fact]
    public async Task The_served_prediction_reaches_the_sink()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("courier-served", extra: "prediction_column: served"));
        var sink = new OrderSink();

        await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, StoreTestData.Start.AddMinutes(3), () => sink, null, CancellationToken.None);

        // Row 0: distance 1, no stops, no load; row 1: distance 1 + 1/7, 7 stops, 45.5 kg (see StoreTestData).
        Assert.Equal(3, sink.Served.Count);
        Assert.Equal(4 + 2.5, sink.Served[0]!.Value, 1e-12);
        Assert.Equal(4 + (2.5 * (1 + (1.0 / 7))) + 21 + (0.02 * 45.5), sink.Served[1]!.Value, 1e-12);
    }

    [Fact]
    public async Task Window_summaries_read_in_parallel_merge_to_the_single_read()
    {
        ModelSpec single = StoreTestData.Spec(StoreTestData.Yaml("summary-single", extra: "prediction_column: served"));
        ModelSpec parallel = StoreTestData.Spec(StoreTestData.Yaml("summary-parallel", extra: "prediction_column: served\nparallel_reads: 4"));
        var reader = new WindowReader();
        var reference = await reader.ReadAsync(database.DataSource, single, StoreTestData.Start, StoreTestData.Start.AddMinutes(600),
            () => new BaselineSink(single.Layout, new BaselineBuilderOptions()), null, CancellationToken.None);
        BaselineReference baseline = reference.Sink.Builder.Build(BaselineOrigin.Fitted);
        var options = new WindowSummaryOptions();

        var one = await reader.ReadAsync(database.DataSource, single, StoreTestData.Start, End, () => new WindowSummarySink(single.Layout, baseline, options), WindowSummarySink.Merge, CancellationToken.None);
        var four = await reader.ReadAsync(database.DataSource, parallel, StoreTestData.Start, End, () => new WindowSummarySink(parallel.Layout, baseline, options), WindowSummarySink.Merge, CancellationToken.None);
        WindowSummary a = one.Sink.Builder.Build();
        WindowSummary b = four.Sink.Builder.Build();

        Assert.Equal(Rows, a.RowsAccepted);
        Assert.Equal(a.RowsAccepted, b.RowsAccepted);
        Assert.Equal(a.ServedCount, b.ServedCount);
        Assert.Equal(a.FeatureBinCounts.Select(c => c.ToList()), b.FeatureBinCounts.Select(c => c.ToList()));
        Assert.Equal(a.DeployedErrorSumOfSquares, b.DeployedErrorSumOfSquares, a.DeployedErrorSumOfSquares * 1e-12);
        for (int j = 0; j < a.Fit!.ParameterCount; j++)
        {
            double expected = a.Fit.Coefficients[j].Estimate!.Value;
            Assert.Equal(expected, b.Fit!.Coefficients[j].Estimate!.Value, Math.Abs(expected) * 1e-12);
        }
    }

    private sealed class OrderSink : IWindowRowSink
    {
        public List<double> Values { get; } = [];

        public List<double?> Served { get; } = [];

        public List<bool> New { get; } = [];

        public void AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool isNew)
        {
            Values.Add(features[0]);
            Served.Add(servedPrediction);
            New.Add(isNew);
        }
    }
}
