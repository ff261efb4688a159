using ModelWatch.Store.Specs;
using ModelWatch.Store.Tests.Support;
using ModelWatch.Store.Windows;
using ModelWatch.Testing.Postgres;
using ModelWatch.Testing.Repository;
using Npgsql;

namespace ModelWatch.Store.Tests.Windows;

/// <summary>
/// Source safety on a real server: the least-privilege recipe in docs/operations.md (run as written) closes what READ ONLY
/// leaves open, <c>model validate</c>'s audit names the gaps of a careless role, the statement timeout never loosens a
/// stricter role setting, and a spec without a source cannot read ModelWatch's own schema.
/// </summary>
public sealed class SourceSafetyTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    private static readonly DateTimeOffset End = StoreTestData.Start.AddHours(2);

    [Fact]
    public async Task The_documented_reader_role_cannot_create_large_objects_notify_lock_or_write()
    {
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, 300);
        string role = "mw_reader_" + Guid.NewGuid().ToString("N")[..8];
        string databaseName = new NpgsqlConnectionStringBuilder(database.ConnectionString).Database!;
        string recipe = DocumentedReaderRecipe()
            .Replace("modelwatch_reader", role, StringComparison.Ordinal)
            .Replace("DATABASE dispatch", $"DATABASE \"{databaseName}\"", StringComparison.Ordinal)
            .Replace("PASSWORD '...'", "PASSWORD 'reader-test-only'", StringComparison.Ordinal);
        await ExecuteAsync(database.DataSource, recipe);
        try
        {
            await using NpgsqlDataSource reader = NpgsqlDataSource.Create(As(role));
            Assert.Equal("42501", await SqlStateAsync(reader, "SELECT lo_from_bytea(0, 'x')"));
            Assert.Equal("42501", await SqlStateAsync(reader, "SELECT pg_notify('channel', 'payload')"));
            Assert.Equal("42501", await SqlStateAsync(reader, "SELECT pg_advisory_lock(42)"));
            Assert.Equal("25006", await SqlStateAsync(reader, "INSERT INTO public.deliveries (at) VALUES (now())"));
            Assert.Equal("42501", await SqlStateAsync(reader, "SELECT pg_read_file('/etc/hostname')"));

            // The audit finds nothing to warn about, while the superuser that set it up is warned about every gap.
            ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("safe-reader", "SELECT at, distance_km, stops, load_kg, minutes FROM public.deliveries WHERE at >= @window_start AND at < @window_end"));
            Assert.Empty(await SourceRoleAudit.WarningsAsync(reader, spec, CancellationToken.None));
            IReadOnlyList<string> careless = await SourceRoleAudit.WarningsAsync(database.DataSource, spec, CancellationToken.None);
            Assert.Contains(careless, w => w.Contains("is a superuser", StringComparison.Ordinal));
            Assert.Contains(careless, w => w.Contains("can create large objects in the source database", StringComparison.Ordinal));
            Assert.Contains(careless, w => w.Contains("owns public.deliveries", StringComparison.Ordinal));
        }
        finally
        {
            await ExecuteAsync(database.DataSource, $"DROP OWNED BY {role}; DROP ROLE {role}");
        }
    }

    [Fact]
    public async Task A_stricter_timeout_on_the_role_is_kept()
    {
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, 300);
        string role = "mw_slow_" + Guid.NewGuid().ToString("N")[..8];
        await ExecuteAsync(database.DataSource, $"""
            CREATE ROLE {role} LOGIN;
            GRANT SELECT ON deliveries TO {role};
            ALTER ROLE {role} SET statement_timeout = '1s';
            """);
        try
        {
            await using NpgsqlDataSource slow = NpgsqlDataSource.Create(As(role));
            ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("slow-reader",
                "WITH pause AS (SELECT pg_sleep(3)) SELECT at, distance_km, stops, load_kg, minutes FROM deliveries, pause WHERE at >= @window_start AND at < @window_end"));

            // The configured timeout is 10 minutes; the role's 1 s wins.
            var ex = await Assert.ThrowsAsync<WindowReadException>(() =>
                new WindowReader(new WindowReadOptions { StatementTimeout = TimeSpan.FromMinutes(10) })
                    .ReadAsync(slow, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None));
            Assert.Equal(WindowReadFailure.Timeout, ex.Failure);

            // And a source's own setting tightens the default.
            var own = await Assert.ThrowsAsync<WindowReadException>(() =>
                new WindowReader(new WindowReadOptions { StatementTimeoutOf = _ => TimeSpan.FromSeconds(1) })
                    .ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None));
            Assert.Equal(WindowReadFailure.Timeout, own.Failure);
        }
        finally
        {
            await ExecuteAsync(database.DataSource, $"DROP OWNED BY {role}; DROP ROLE {role}");
        }
    }

    [Fact]
    public async Task A_spec_without_a_source_cannot_read_the_state_schema()
    {
        await StoreTestData.MigrateAsync(database);
        await StoreTestData.CreateDeliveriesAsync(database.DataSource, 300);
        await ExecuteAsync(database.DataSource, "CREATE OR REPLACE VIEW public.alert_mirror AS SELECT opened_at AS at, id::float8 AS distance_km, 1 AS stops, 1::numeric AS load_kg, 1::float8 AS minutes FROM modelwatch.alert");
        foreach (string from in (string[])["modelwatch.alert", "public.alert_mirror"])
        {
            string query = from == "modelwatch.alert"
                ? "SELECT opened_at AS at, id::float8 AS distance_km, 1 AS stops, 1::numeric AS load_kg, 1::float8 AS minutes FROM modelwatch.alert WHERE opened_at >= @window_start AND opened_at < @window_end"
                : "SELECT * FROM public.alert_mirror WHERE at >= @window_start AND at < @window_end";
            ModelSpec spec = StoreTestData.Spec(StoreTestData.Yaml("peeking", query));
            var ex = await Assert.ThrowsAsync<WindowReadException>(() =>
                new WindowReader().ReadAsync(database.DataSource, spec, StoreTestData.Start, End, () => new AccumulatorSink(spec.Layout), null, CancellationToken.None));
            Assert.Contains("model peeking: the query reads modelwatch.alert, ModelWatch's own state; a spec without 'source:' may read other schemas", ex.Message, StringComparison.Ordinal);
        }
    }

    private string As(string role) => new NpgsqlConnectionStringBuilder(database.ConnectionString) { Username = role, Password = "reader-test-only", Pooling = false }.ConnectionString;

    private static string DocumentedReaderRecipe() => RepositoryFiles.CodeBlock("operations.md", "Each data source — read-only", "sql");

    private static async Task ExecuteAsync(NpgsqlDataSource source, string sql)
    {
        await using NpgsqlCommand command = source.CreateCommand(sql);
        await command.ExecuteNonQueryAsync();
    }

    private static async Task<string?> SqlStateAsync(NpgsqlDataSource source, string sql)
    {
        try
        {
            await using NpgsqlCommand command = source.CreateCommand(sql);
            await command.ExecuteNonQueryAsync();
            return null;
        }
        catch (PostgresException ex)
        {
            return ex.SqlState;
        }
    }
}
