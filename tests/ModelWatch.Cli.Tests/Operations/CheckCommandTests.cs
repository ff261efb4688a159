using System.Text.Json;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary><c>modelwatch check</c> without <c>--record</c> on a real PostgreSQL over the invented laundry scenario.</summary>
public sealed class CheckCommandTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-check-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task The_json_has_exactly_the_documented_fields()
    {
        CliRun run = await Check("--at", "2026-02-02T15:20:00Z", "--format", "json");

        Assert.True(run.ExitCode == 0, run.Error);
        using JsonDocument json = JsonDocument.Parse(run.Output);
        JsonElement root = json.RootElement;
        Assert.Equal(["model", "slot", "window", "status", "reason", "rows", "findings"], Names(root));
        Assert.Equal(LaundryScenario.Key, root.GetProperty("model").GetString());
        Assert.Equal("2026-02-02T15:00:00Z", root.GetProperty("slot").GetString());
        Assert.Equal(["start", "end"], Names(root.GetProperty("window")));
        Assert.Equal("2026-02-02T13:00:00Z", root.GetProperty("window").GetProperty("start").GetString());
        Assert.Equal("2026-02-02T15:00:00Z", root.GetProperty("window").GetProperty("end").GetString());
        Assert.Equal("ok", root.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, root.GetProperty("reason").ValueKind);
        Assert.Equal(24, root.GetProperty("rows").GetInt64());
        JsonElement[] findings = [.. root.GetProperty("findings").EnumerateArray()];
        Assert.All(findings, f => Assert.Equal(["check", "subject", "severity", "statistic", "value", "threshold", "p_value", "alpha", "limit", "explanation"], Names(f)));

        // threshold is the alpha where a p-value graded the finding, else the limit; levels and p-values are probabilities.
        Assert.All(findings, f =>
        {
            double? alpha = Number(f, "alpha");
            Assert.Equal(alpha ?? Number(f, "limit"), Number(f, "threshold"));
            Assert.True(alpha is null or (> 0 and < 1), f.ToString());
            Assert.True(Number(f, "p_value") is null or (>= 0 and <= 1), f.ToString());
            Assert.True(alpha is null || Number(f, "p_value") is not null, f.ToString());
        });
        JsonElement wald = findings.Single(f => f.GetProperty("statistic").GetString() == "wald");
        Assert.NotNull(Number(wald, "alpha"));
        Assert.True(Number(wald, "value") > Number(wald, "limit"), wald.ToString());
        Assert.True(Number(wald, "p_value") < Number(wald, "alpha"), wald.ToString());
        Assert.Contains(findings, f => f.GetProperty("statistic").GetString() == "cusum" && Number(f, "alpha") is null && Number(f, "limit") > 0);
        Assert.Contains(findings, f => f.GetProperty("check").GetString() == "coefficients" && f.GetProperty("severity").GetString() == "critical");
        Assert.Contains(findings, f => f.GetProperty("subject").ValueKind == JsonValueKind.Null);
        Assert.All(findings, f => Assert.Contains(f.GetProperty("severity").GetString(), new[] { "ok", "warning", "critical" }));
    }

    [Fact]
    public async Task Fail_on_critical_exits_1_after_the_change_and_0_before()
    {
        CliRun before = await Check("--at", "2026-02-02T09:00:00Z", "--fail-on", "critical");
        CliRun after = await Check("--at", "2026-02-02T15:00:00Z", "--fail-on", "critical");
        CliRun unasked = await Check("--at", "2026-02-02T15:00:00Z");

        Assert.True(before.ExitCode == ExitCodes.Ok, before.Output + before.Error);
        Assert.Equal(ExitCodes.Findings, after.ExitCode);
        Assert.Equal(ExitCodes.Ok, unasked.ExitCode);
        Assert.Contains("worst severity critical", after.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_check_without_record_writes_nothing()
    {
        string before = await LaundryScenario.StoredCountsAsync(database);

        CliRun run = await Check("--at", "2026-02-02T15:00:00Z");

        Assert.True(run.ExitCode == 0, run.Error);
        Assert.StartsWith("model laundry-cycles, slot 2026-02-02T15:00:00Z, window 2026-02-02T13:00:00Z → 2026-02-02T15:00:00Z", run.Output, StringComparison.Ordinal);
        Assert.Equal(before, await LaundryScenario.StoredCountsAsync(database));
    }

    [Fact]
    public async Task A_window_without_rows_is_skipped_and_the_quiet_source_is_a_warning()
    {
        // The rows end at 2026-02-03T00:00; the 01:00 window holds only rows the 00:00 window has read, so the 02:00
        // window is the second run in a row without new rows.
        CliRun run = await Check("--at", "2026-02-03T02:00:00Z", "--format", "json", "--fail-on", "warning");
        CliRun critical = await Check("--at", "2026-02-03T02:00:00Z", "--fail-on", "critical");

        Assert.Equal(ExitCodes.Findings, run.ExitCode);
        Assert.Equal(ExitCodes.Ok, critical.ExitCode);
        using JsonDocument json = JsonDocument.Parse(run.Output);
        Assert.Equal("skipped", json.RootElement.GetProperty("status").GetString());
        Assert.StartsWith("insufficient_data: 0 usable row(s)", json.RootElement.GetProperty("reason").GetString(), StringComparison.Ordinal);
        Assert.Equal(0, json.RootElement.GetProperty("rows").GetInt64());
        // The quiet source warns; the source check says the run read its window (it did: the window was empty).
        JsonElement[] findings = [.. json.RootElement.GetProperty("findings").EnumerateArray()];
        Assert.Equal(["data", "source"], findings.Select(f => f.GetProperty("check").GetString()));
        Assert.Equal("quiet_source", findings[0].GetProperty("statistic").GetString());
        Assert.Equal(2, findings[0].GetProperty("value").GetDouble());
        Assert.Equal("warning", findings[0].GetProperty("severity").GetString());
        Assert.Equal("ok", findings[1].GetProperty("severity").GetString());
        Assert.Contains("skipped tests: 7 insufficient_data", critical.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_source_quiet_for_weeks_before_the_slot_is_critical()
    {
        CliRun run = await Check("--at", "2026-03-01T00:00:00Z", "--fail-on", "critical");

        // Every hourly slot from 2026-02-03T01:00 to 2026-03-01T00:00 brought no new rows: 26 days × 24 = 624 runs.
        Assert.Equal(ExitCodes.Findings, run.ExitCode);
        Assert.Contains("the data source brought no new usable rows for 624 runs in a row", run.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_unknown_model_exits_3_naming_it()
    {
        CliRun run = await LaundryScenario.Cli(database, "check", "no-such-model", "--at", "2026-02-02T15:00:00Z");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("modelwatch check: no model 'no-such-model'", run.Error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("--at", "noon", "--at: 'noon' is not a time; use RFC 3339")]
    [InlineData("--fail-on", "ok", "--fail-on: 'ok' is not a severity to fail on; use warning or critical")]
    public async Task A_bad_option_is_a_usage_error(string option, string value, string message)
    {
        CliRun run = await Check(option, value);

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
    }

    private static double? Number(JsonElement finding, string name) =>
        finding.GetProperty(name).ValueKind == JsonValueKind.Null ? null : finding.GetProperty(name).GetDouble();

    private Task<CliRun> Check(params string[] extra) => LaundryScenario.Cli(database, ["check", LaundryScenario.Key, .. extra]);

    private static string[] Names(JsonElement element) => [.. element.EnumerateObject().Select(p => p.Name)];
}
