using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Store.Windows;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Store.Tests.Baselines;

public sealed class BaselineServiceTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private const int Rows = 1_500;
    private static readonly DateTimeOffset End = StoreTestData.Start.AddMinutes(Rows);

    public async Task InitializeAsync()
    {
        await StoreTestData.MigrateAsync(database);
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, Rows);
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task A_fitted_baseline_round_trips_through_the_state_database()
    {
        var spec = await StoreTestData.ApplyAsync(database, StoreTestData.Yaml("fit-round-trip"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);

        StoredBaseline stored = await service.FitAsync("fit-round-trip", StoreTestData.Start, End, "tester", CancellationToken.None);

        var direct = await new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None);
        FitSummary fit = LeastSquaresFit.Fit(direct.Sink.Accumulator.ToFactor());
        BaselineReference reference = stored.Reference;
        Assert.Equal(1, stored.Version);
        Assert.Equal(BaselineOrigin.Fitted, reference.Origin);
        Assert.Equal("tester", stored.CreatedBy);
        Assert.Equal(StoreTestData.Start, stored.ReferenceWindowStart);
        Assert.Equal(End, stored.ReferenceWindowEnd);
        Assert.Equal(spec.DesignSignature, stored.DesignSignature);
        Assert.Equal(Rows, reference.RowCount);
        foreach (CoefficientEstimate c in fit.Coefficients)
        {
            Assert.Equal(c.Estimate!.Value, reference.Coefficients[c.Term], Math.Abs(c.Estimate.Value) * 1e-12);
        }

        Assert.Equal(fit.ResidualStandardDeviation, reference.ResidualStandardDeviation, 1e-12);
        Assert.NotNull(reference.Factor);
        Assert.Equal(spec.Layout.Width, reference.Factor!.Length);
        Assert.Equal(3, reference.FeatureBins.Count);
        Assert.Equal(Rows, reference.ResidualSample.Count);
        Assert.NotNull(reference.Covariance);
        Assert.NotNull(reference.ConditionNumber);

        // The typed columns agree with the document.
        Assert.Equal(Rows, await StoreTestData.CountAsync(database.DataSource, "SELECT row_count FROM modelwatch.baseline WHERE model_key = 'fit-round-trip'"));
        Assert.Equal(1, await StoreTestData.CountAsync(database.DataSource,
            "SELECT count(*) FROM modelwatch.baseline WHERE model_key = 'fit-round-trip' AND origin = 'fitted' AND terms = ARRAY['(intercept)','distance_km','stops','load_kg'] AND reference->>'origin' = 'fitted'"));
    }

    [Fact]
    public async Task Every_change_is_a_new_version_and_a_design_change_makes_the_baseline_incompatible()
    {
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml("versions"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);
        var models = new ModelRepository(database.DataSource, TimeProvider.System, StoreTestData.CommandTimeout);

        StoredBaseline first = await service.FitAsync("versions", StoreTestData.Start, End, "tester", CancellationToken.None);
        StoredBaseline second = await service.FitAsync("versions", StoreTestData.Start, StoreTestData.Start.AddMinutes(500), "tester", CancellationToken.None);
        Assert.True((await models.GetAsync("versions", CancellationToken.None))!.HasCompatibleBaseline);

        var outcome = await models.ApplyAsync([(StoreTestData.Spec(StoreTestData.Yaml("versions", features: "[distance_km, stops]")), null)], false, CancellationToken.None);

        Assert.Equal((1, 2), (first.Version, second.Version));
        Assert.Contains("runs are skipped until a new baseline exists", outcome[0].BaselineNote, StringComparison.Ordinal);
        ModelRecord record = (await models.GetAsync("versions", CancellationToken.None))!;
        Assert.False(record.HasCompatibleBaseline);
        Assert.Contains("baseline version 2 was made for 'minutes ~ 1 + distance_km + stops + load_kg'", record.BaselineProblem, StringComparison.Ordinal);
    }

    [Fact]
    public async Task The_fit_command_json_is_imported_as_is()
    {
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml("import-fit-json"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);
        const string json = """
            { "n": 900, "p": 4, "rank": 4, "intercept": true,
              "coefficients": [
                { "term": "(intercept)", "estimate": 4.1, "std_error": 0.2, "t": 20.5, "p_value": 0.0 },
                { "term": "distance_km", "estimate": 2.45, "std_error": 0.03, "t": 81.6, "p_value": 0.0 },
                { "term": "stops", "estimate": 3.02, "std_error": 0.02, "t": 151.0, "p_value": 0.0 },
                { "term": "load_kg", "estimate": 0.019, "std_error": 0.001, "t": 19.0, "p_value": 0.0 } ],
              "rss": 3500.0, "residual_sd": 1.98, "r_squared": 0.95, "adj_r_squared": 0.95, "f_statistic": 5000, "f_p_value": 0.0,
              "condition_number": 12.5, "vif": { "distance_km": 1.01, "stops": 1.0, "load_kg": 1.02 } }
            """;

        StoredBaseline stored = await service.ImportAsync("import-fit-json", "fit.json", json, null, "pipeline", CancellationToken.None);

        BaselineReference reference = stored.Reference;
        Assert.Equal(BaselineOrigin.Imported, reference.Origin);
        Assert.Equal(2.45, reference.Coefficients["distance_km"]);
        Assert.Equal([0.2, 0.03, 0.02, 0.001], reference.StandardErrors!);
        Assert.Null(reference.Covariance);
        Assert.Equal(900, reference.RowCount);
        Assert.Equal(1.98, reference.ResidualStandardDeviation);
        Assert.Null(reference.Factor);
        Assert.Null(stored.ReferenceWindowStart);
    }

    [Fact]
    public async Task Our_import_format_with_a_reference_window_completes_the_statistics()
    {
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml("import-own", features: "[distance_km, stops]"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);
        const string json = """
            { "coefficients": { "(intercept)": 4.0, "distance_km": 2.5, "stops": 3.0 },
              "covariance": [[0.04, 0, 0], [0, 0.0009, 0], [0, 0, 0.0004]],
              "n": 5000, "residual_sd": 2.0 }
            """;

        StoredBaseline stored = await service.ImportAsync("import-own", "own.json", json, (StoreTestData.Start, End), "pipeline", CancellationToken.None);

        BaselineReference reference = stored.Reference;
        Assert.Equal(3.0, reference.Coefficients["stops"]);
        Assert.Equal(0.0009, reference.Covariance![1][1]);
        Assert.Equal(5000, reference.RowCount);
        Assert.NotNull(reference.Factor);
        Assert.Equal(Rows, reference.FactorRowCount);
        Assert.Equal(2, reference.FeatureBins.Count);
        Assert.Equal(StoreTestData.Start, stored.ReferenceWindowStart);
    }

    [Theory]
    [InlineData("""{ "coefficients": { "(intercept)": 4.0, "distance_km": 2.5 } }""", "term 'stops' of the spec is missing")]
    [InlineData("""{ "coefficients": { "(intercept)": 4.0, "distance_km": 2.5, "stops": 3, "weather": 1 }, "residual_sd": 1 }""", "term 'weather' is not in the spec")]
    [InlineData("""{ "coefficients": { "(intercept)": 4.0, "distance_km": 2.5, "stops": 3 }, "covariance": [[1, 0], [0, 1]] }""", "covariance: must be a 3×3 array")]
    [InlineData("""{ "coefficients": [ { "term": "(intercept)", "estimate": null } ], "intercept": false }""", "has no estimate")]
    [InlineData("""{ "coefficients": { "(intercept)": 4.0, "distance_km": 2.5, "stops": 3 } }""", "needs a residual standard deviation")]
    [InlineData("{ not json", "not valid JSON")]
    public async Task A_bad_import_file_is_refused_and_stores_nothing(string json, string message)
    {
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml("import-bad", features: "[distance_km, stops]"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);

        var ex = await Assert.ThrowsAsync<BaselineException>(() => service.ImportAsync("import-bad", "bad.json", json, null, "pipeline", CancellationToken.None));

        Assert.Contains(message, ex.Message, StringComparison.Ordinal);
        Assert.Equal(0, await StoreTestData.CountAsync(database.DataSource, "SELECT count(*) FROM modelwatch.baseline WHERE model_key = 'import-bad'"));
    }

    [Theory]
    [InlineData("distance_km * 2", "double_km")]
    [InlineData("7.5", "double_km")]
    public async Task A_collinear_or_constant_reference_window_is_refused_naming_the_column(string expression, string column)
    {
        string key = expression.Length > 5 ? "collinear" : "constant";
        await StoreTestData.ApplyAsync(database, StoreTestData.Yaml(key,
            $"SELECT at, distance_km, {expression} AS double_km, minutes FROM deliveries WHERE at >= @window_start AND at < @window_end",
            "[distance_km, double_km]"));
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);

        var ex = await Assert.ThrowsAsync<BaselineException>(() => service.FitAsync(key, StoreTestData.Start, End, "tester", CancellationToken.None));

        Assert.StartsWith($"model {key}: cannot fit a baseline on [2026-03-01T00:00:00Z, 2026-03-02T01:00:00Z)", ex.Message, StringComparison.Ordinal);
        Assert.Contains(column, ex.Message, StringComparison.Ordinal);
        Assert.Equal(0, await StoreTestData.CountAsync(database.DataSource, $"SELECT count(*) FROM modelwatch.baseline WHERE model_key = '{key}'"));
    }

    [Fact]
    public async Task A_baseline_for_an_unknown_model_is_refused()
    {
        await using StoreDataSources databases = StoreTestData.DataSources(database);
        var service = new BaselineService(databases, TimeProvider.System, StoreTestData.CommandTimeout);

        var ex = await Assert.ThrowsAsync<BaselineException>(() => service.FitAsync("nobody", StoreTestData.Start, End, "tester", CancellationToken.None));

        Assert.Contains("model nobody: no such model", ex.Message, StringComparison.Ordinal);
    }
}
