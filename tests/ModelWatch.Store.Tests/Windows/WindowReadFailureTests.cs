using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Store.Windows;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Store.Tests.Windows;

/// <summary>
/// Bad sources: each read fails with an error naming the model (and the column where there is one), and the
/// state database holds no baseline afterwards. The failing reads go through <see cref="BaselineService.FitAsync"/>,
/// the path that would write if the read succeeded.
/// </summary>
public sealed class WindowReadFailureTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private const int Rows = 300;
    private static readonly DateTimeOffset End = StoreTestData.Start.AddMinutes(Rows);

    public async Task InitializeAsync()
    {
        await StoreTestData.MigrateAsync(database);
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, Rows);
        await using NpgsqlCommand setup = database.DataSource.CreateCommand("""
            CREATE TABLE IF NOT EXISTS read_log (n int);
            CREATE OR REPLACE FUNCTION log_read() RETURNS int LANGUAGE sql VOLATILE AS 'INSERT INTO read_log VALUES (1) RETURNING n';
            CREATE OR REPLACE VIEW gappy AS
              SELECT at, distance_km, CASE WHEN extract(minute FROM at)::int % 10 = 3 THEN NULL ELSE stops END AS stops,
                     load_kg, CASE WHEN extract(minute FROM at)::int % 25 = 7 THEN 'NaN'::float8 ELSE minutes END AS minutes
              FROM deliveries;
            """);
        await setup.ExecuteNonQueryAsync();
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task A_missing_column_is_named_with_the_columns_the_query_has()
    {
        var ex = await FailAsync("bad-missing", StoreTestData.Yaml("bad-missing", features: "[distance_km, weather]"));

        Assert.Equal(WindowReadFailure.MissingColumn, ex.Failure);
        Assert.Equal("weather", ex.Column);
        Assert.Contains("model bad-missing: feature column 'weather' is not in the query's result (it has: at, distance_km, stops", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_text_column_is_refused_before_any_row_is_read()
    {
        var ex = await FailAsync("bad-text", StoreTestData.Yaml("bad-text", features: "[distance_km, note]"));

        Assert.Equal(WindowReadFailure.ColumnType, ex.Failure);
        Assert.Equal("note", ex.Column);
        Assert.Contains("model bad-text: feature column 'note' has type text", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Nulls_and_nans_under_skip_row_are_counted_by_column_and_left_out()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("gaps-skip", Gappy, extra: "missing: skip-row"));

        var read = await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None);

        // Five hours of rows: minutes-past-the-hour 3, 13, ..., 53 have a NULL stop count (6 an hour, 30 rows);
        // minutes 7, 32 and 57 a NaN outcome (3 an hour, 15 rows); no minute has both.
        Assert.Equal(Rows, read.RowsRead);
        Assert.Equal(30, read.RejectedReasons["null:stops"]);
        Assert.Equal(15, read.RejectedReasons["non_finite:minutes"]);
        Assert.Equal(45, read.RowsRejected);
        Assert.Equal(Rows - 45, read.Sink.Accumulator.RowCount);
    }

    [Fact]
    public async Task A_null_under_fail_names_the_column_and_the_row()
    {
        var ex = await FailAsync("gaps-fail", StoreTestData.Yaml("gaps-fail", Gappy, extra: "missing: fail"));

        Assert.Equal(WindowReadFailure.MissingValue, ex.Failure);
        Assert.Equal("stops", ex.Column);
        Assert.Contains("model gaps-fail: column 'stops' holds NULL in row 4 of the window (missing: fail)", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_failing_sub_range_of_a_parallel_read_reports_its_own_error()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("gaps-parallel", Gappy, extra: "missing: fail\nparallel_reads: 3"));

        var ex = await Assert.ThrowsAsync<WindowReadException>(() =>
            new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), AccumulatorSink.Merge, CancellationToken.None));

        Assert.Equal(WindowReadFailure.MissingValue, ex.Failure);
        Assert.Equal("stops", ex.Column);
    }

    [Fact]
    public async Task A_nan_under_fail_names_the_column()
    {
        var ex = await FailAsync("nan-fail", StoreTestData.Yaml("nan-fail", Gappy, features: "[distance_km, load_kg]", extra: "missing: fail"));

        Assert.Equal(WindowReadFailure.MissingValue, ex.Failure);
        Assert.Equal("minutes", ex.Column);
        Assert.Contains("column 'minutes' holds a NaN or infinite value in row 8", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_empty_window_is_too_few_rows()
    {
        var ex = await FailAsync("empty-window", StoreTestData.Yaml("empty-window"), from: End.AddDays(1), to: End.AddDays(2));

        Assert.Equal(WindowReadFailure.TooFewRows, ex.Failure);
        Assert.Contains("model empty-window: the window [2026-03-02T05:00:00Z, 2026-03-03T05:00:00Z) has 0 usable row(s) of 0 read; min_rows is 20", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_syntax_error_says_where()
    {
        var ex = await FailAsync("bad-sql", StoreTestData.Yaml("bad-sql", "SELEC at, distance_km FROM deliveries WHERE at >= @window_start AND at < @window_end"));

        Assert.Equal(WindowReadFailure.QueryError, ex.Failure);
        Assert.Equal("42601", ex.SqlState);
        Assert.Contains("model bad-sql: the query is not valid SQL: syntax error at or near \"SELEC\" at character", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_query_that_writes_fails_with_25006_and_writes_nothing()
    {
        var ex = await FailAsync("writes", StoreTestData.Yaml("writes", "SELECT d.*, log_read() AS logged FROM deliveries d WHERE at >= @window_start AND at < @window_end"));

        Assert.Equal(WindowReadFailure.ReadOnlyViolation, ex.Failure);
        Assert.Equal("25006", ex.SqlState);
        Assert.Contains("model writes: the query tried to write", ex.Message, StringComparison.Ordinal);
        Assert.Equal(0, await StoreTestData.CountAsync(database.DataSource, "SELECT count(*) FROM read_log"));
    }

    [Fact]
    public async Task A_slow_query_is_cut_by_the_statement_timeout_with_57014()
    {
        var options = new WindowReadOptions { StatementTimeout = TimeSpan.FromMilliseconds(300) };

        var ex = await FailAsync("slow", StoreTestData.Yaml("slow", "SELECT d.* FROM deliveries d CROSS JOIN pg_sleep(30) WHERE at >= @window_start AND at < @window_end"), options: options);

        Assert.Equal(WindowReadFailure.Timeout, ex.Failure);
        Assert.Equal("57014", ex.SqlState);
        Assert.Contains("model slow: the query was cancelled by the statement timeout", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_unreachable_source_is_named()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("far-away", extra: "source: warehouse"));
        await using NpgsqlDataSource nowhere = StoreDataSources.Build("Host=127.0.0.1;Port=1;Username=x;Timeout=2;Pooling=false", "nowhere");

        var ex = await Assert.ThrowsAsync<WindowReadException>(() =>
            new WindowReader().ReadAsync(nowhere, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None));

        Assert.Equal(WindowReadFailure.SourceUnavailable, ex.Failure);
        Assert.Contains("model far-away: cannot read from data source 'warehouse'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_cancelled_token_stops_the_read()
    {
        ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("cancelled", "SELECT d.* FROM deliveries d CROSS JOIN pg_sleep(30) WHERE at >= @window_start AND at < @window_end"));
        using var cancel = new CancellationTokenSource();
        cancel.CancelAfter(TimeSpan.FromMilliseconds(300));

        await Assert.ThrowsAnyAsync<OperationCanceledException>(() =>
            new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, cancel.Token));
    }

    private const string Gappy = "SELECT * FROM gappy WHERE at >= @window_start AND at < @window_end";

    private async Task<WindowReadException> FailAsync(string key, string yaml, DateTimeOffset? from = null, DateTimeOffset? to = null, WindowReadOptions? options = null)
    {
        await StoreTestData.ApplyAsync(database, yaml);
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout, options);

        var ex = await Assert.ThrowsAsync<WindowReadException>(() =>
            service.FitAsync(key, from ?? StoreTestData.Start, to ?? End, "test", CancellationToken.None));

        Assert.Equal(key, ex.ModelKey);
        Assert.Equal(0, await StoreTestData.CountAsync(database.DataSource, $"SELECT count(*) FROM modelwatch.baseline WHERE model_key = '{key}'"));
        return ex;
    }
}
