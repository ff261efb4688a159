using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Demo;

/// <summary>The demo runs the daemon over every enabled model, so it refuses a database that watches others.</summary>
public sealed class DemoRefusalTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task The_demo_refuses_a_database_that_watches_other_models()
    {
        CliRun migrate = await CliRun.InvokeAsync("migrate", "--database", database.ConnectionString);
        Assert.Equal(ExitCodes.Ok, migrate.ExitCode);
        string spec = Path.Combine(Directory.CreateTempSubdirectory("mw-demo-").FullName, "other.yaml");
        await File.WriteAllTextAsync(spec, """
            key: other-model
            query: SELECT now() AS at, 1.0 AS x, 2.0 AS y WHERE now() >= @window_start AND now() < @window_end
            time_column: at
            outcome: y
            features: [x]
            schedule: 1h
            window: 1h
            """);
        Assert.Equal(ExitCodes.Ok, (await CliRun.InvokeAsync("model", "apply", spec, "--database", database.ConnectionString)).ExitCode);

        CliRun run = await CliRun.InvokeAsync("demo", "--database", database.ConnectionString);

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("other-model", run.Error, StringComparison.Ordinal);
    }
}
