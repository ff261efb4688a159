namespace ModelWatch.Cli.Tests.Daemon;

public sealed class DaemonCommandTests
{
    [Fact]
    public async Task Without_a_state_database_the_daemon_says_how_to_give_one_and_exits_three()
    {
        Assert.True(
            string.IsNullOrEmpty(Environment.GetEnvironmentVariable("ConnectionStrings__State")),
            "this test expects no state database in the environment");

        CliRun run = await CliRun.InvokeAsync("daemon");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("no state database: pass --database or set ConnectionStrings:State", run.Error, StringComparison.Ordinal);
    }
}
