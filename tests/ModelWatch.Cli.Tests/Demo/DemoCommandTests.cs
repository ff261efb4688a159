using ModelWatch.Cli.Demo;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Demo;

/// <summary>
/// <c>modelwatch demo --database</c> end to end on a real PostgreSQL: the real daemon on the accelerated clock raises an
/// alert on the right check inside each planted incident, and nothing in the clean days before the first.
/// </summary>
public sealed class DemoCommandTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task The_demo_catches_each_planted_incident_with_its_check_and_raises_nothing_before_the_first()
    {
        CliRun run = await CliRun.InvokeAsync("demo", "--database", database.ConnectionString);

        Assert.True(run.ExitCode == ExitCodes.Ok, run.Output + run.Error);
        Assert.True(run.Output.Contains("3 of 3 incidents caught", StringComparison.Ordinal), run.Output + run.Error);
        long runs = await Count("SELECT count(*) FROM modelwatch.run WHERE model_key = 'courier-eta' AND status = 'ok'");
        Assert.Equal(DemoScenario.ExpectedRuns, runs);

        var alerts = await new AlertRepository(database.DataSource, TimeSpan.FromSeconds(30)).ListAsync(DemoScenario.ModelKey, null, 1000, CancellationToken.None);
        foreach (DemoIncident incident in DemoScenario.Incidents)
        {
            Assert.Contains(alerts, a => a.Check == incident.Check && incident.Covers(DemoSummary.Utc(a.OpenedAt)));
        }

        Assert.DoesNotContain(alerts, a => DemoSummary.Utc(a.OpenedAt) < DemoScenario.CoefficientChange.Start);
        // Every alert of the incidents resolves in the clean days that follow them.
        Assert.All(alerts, a => Assert.Equal("resolved", a.State));
        string reportLine = run.Output.Split('\n').Single(l => l.StartsWith("Evidence report", StringComparison.Ordinal));
        string report = reportLine[(reportLine.LastIndexOf(": ", StringComparison.Ordinal) + 2)..].Trim();
        Assert.True(File.Exists(report), report);
        Assert.Contains("<svg", await File.ReadAllTextAsync(report), StringComparison.Ordinal);
        File.Delete(report);
    }

    private async Task<long> Count(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }
}
