using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Store.Tests;

public sealed class PostgresFixtureTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task Fixture_connects_to_its_own_database()
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand("SELECT current_database(), current_setting('server_version_num')::int");
        await using NpgsqlDataReader reader = await command.ExecuteReaderAsync();
        Assert.True(await reader.ReadAsync());
        Assert.Equal(database.Name, reader.GetString(0));
        Assert.True(reader.GetInt32(1) >= 130000, "DROP DATABASE ... WITH (FORCE) needs PostgreSQL 13 or later");
    }

    [Fact]
    public async Task Fixture_database_accepts_writes_and_reads_them_back()
    {
        await using (NpgsqlCommand create = database.DataSource.CreateCommand("CREATE TABLE probe (x float8 NOT NULL); INSERT INTO probe SELECT g / 4.0 FROM generate_series(1, 8) g"))
        {
            await create.ExecuteNonQueryAsync();
        }

        await using NpgsqlCommand sum = database.DataSource.CreateCommand("SELECT sum(x) FROM probe");
        Assert.Equal(9.0, (double)(await sum.ExecuteScalarAsync())!);
    }
}
