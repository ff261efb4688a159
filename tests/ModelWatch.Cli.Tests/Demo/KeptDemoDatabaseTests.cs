using ModelWatch.Cli.Demo;
using ModelWatch.Daemon.Persistence;
using ModelWatch.Store.Local;
using Npgsql;

namespace ModelWatch.Cli.Tests.Demo;

/// <summary>
/// <c>demo --stop</c> finds a cluster a demo left running with <c>--keep</c> from its state file, stops its server and
/// removes its folder; the demo names the alert a returning condition follows.
/// </summary>
public sealed class KeptDemoDatabaseTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-kept-").FullName;

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Stop_stops_the_kept_cluster_and_removes_its_folder_and_state_file()
    {
        string binaries = ThrowawayCluster.FindBinaries() ?? throw new InvalidOperationException("this test needs PostgreSQL server binaries (apt-get install postgresql)");
        ThrowawayCluster cluster = await ThrowawayCluster.StartAsync(binaries);
        string root = cluster.Root;
        string connection = cluster.ConnectionString;
        CliRun run;
        try
        {
            using (KeptDemoDatabases.UseFolder(_folder))
            {
                string state = KeptDemoDatabases.Remember(cluster);
                Assert.True(File.Exists(state));
                Assert.NotNull(cluster.ServerProcessId);

                run = await CliRun.InvokeAsync("demo", "--stop");
            }
        }
        finally
        {
            if (Directory.Exists(root))
            {
                // The stop failed: the test still leaves no server behind.
                await cluster.DisposeAsync();
            }
        }

        Assert.True(run.ExitCode == ExitCodes.Ok, run.Output + run.Error);
        Assert.Equal($"Stopped the kept demo database on port {cluster.Port} and removed {root}.", run.Output.Trim());
        Assert.False(Directory.Exists(root));
        Assert.Empty(Directory.GetFiles(_folder));
        await using var database = NpgsqlDataSource.Create(connection + ";Timeout=2");
        await Assert.ThrowsAnyAsync<NpgsqlException>(async () => await database.OpenConnectionAsync());
    }

    [Fact]
    public async Task Stop_without_a_kept_database_is_exit_3_and_says_where_it_looked()
    {
        CliRun run;
        using (KeptDemoDatabases.UseFolder(_folder))
        {
            run = await CliRun.InvokeAsync("demo", "--stop");
        }

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains($"modelwatch demo: no kept demo database found (none recorded under {_folder})", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Stop_with_keep_is_a_usage_error()
    {
        CliRun run = await CliRun.InvokeAsync("demo", "--stop", "--keep");

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains("--stop runs no demo: give it alone, without --keep or --database", run.Error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("opened", 7L, "OPENED (again, after #7)")]
    [InlineData("opened", null, "OPENED")]
    [InlineData("resolved", 7L, "RESOLVED")]
    public void A_transition_names_the_alert_it_follows(string transition, long? previous, string expected)
    {
        var entry = new ModelAlertEvent { AlertId = 12, PreviousAlertId = previous, Transition = transition, Severity = "critical", Check = "residuals", Explanation = "persistent bias" };

        Assert.Equal(expected, DemoSummary.What(entry));
        Assert.Contains($"alert #12 {expected}", DemoSummary.Describe(entry), StringComparison.Ordinal);
    }
}
