using ModelWatch.Cli.Tests.Operations;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>Every command that takes a model key treats an unknown one the same way: exit 3, the key, the nearest key.</summary>
public sealed class UnknownModelTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-unknown-model-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Theory]
    [InlineData("runs list", "runs list laundry-cycle")]
    [InlineData("model show", "model show laundry-cycle")]
    [InlineData("model validate", "model validate laundry-cycle")]
    [InlineData("check", "check laundry-cycle")]
    [InlineData("backtest", "backtest laundry-cycle --from 2026-02-02T00:00:00Z --to 2026-02-02T01:00:00Z")]
    [InlineData("alerts list", "alerts list laundry-cycle")]
    [InlineData("quiet", "quiet laundry-cycle --for 1h --reason maintenance")]
    [InlineData("quiet list", "quiet list --model laundry-cycle")]
    [InlineData("baseline fit", "baseline fit laundry-cycle --from 2026-02-01T00:00:00Z --to 2026-02-02T00:00:00Z")]
    [InlineData("baseline list", "baseline list laundry-cycle")]
    [InlineData("baseline show", "baseline show laundry-cycle")]
    [InlineData("baseline diff", "baseline diff laundry-cycle 1 2")]
    [InlineData("baseline activate", "baseline activate laundry-cycle 1")]
    public async Task A_typo_exits_3_and_names_the_registered_key(string command, string line)
    {
        CliRun run = await LaundryScenario.Cli(database, line.Split(' '));

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Equal($"modelwatch {command}: no model 'laundry-cycle'; did you mean 'laundry-cycles'?", run.Error.Trim());
        Assert.Equal(string.Empty, run.Output);
    }

    [Fact]
    public async Task A_key_like_no_other_gets_no_suggestion()
    {
        CliRun run = await LaundryScenario.Cli(database, "runs", "list", "warehouse-load");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Equal("modelwatch runs list: no model 'warehouse-load'", run.Error.Trim());
    }

    [Fact]
    public async Task A_registered_key_with_no_runs_lists_none_and_exits_0()
    {
        CliRun run = await LaundryScenario.Cli(database, "runs", "list", LaundryScenario.Key);

        Assert.True(run.ExitCode == ExitCodes.Ok, run.Error);
        Assert.StartsWith("ID", run.Output, StringComparison.Ordinal);
    }
}
