using System.Text.Json;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Operations;

/// <summary><c>modelwatch backtest</c> on a real PostgreSQL over the invented laundry scenario.</summary>
public sealed class BacktestCommandTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-backtest-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task The_changed_relationship_opens_an_alert_after_the_change_and_none_before()
    {
        CliRun run = await Backtest("--format", "json");

        Assert.True(run.ExitCode == 0, run.Error);
        using JsonDocument json = JsonDocument.Parse(run.Output);
        JsonElement[] alerts = [.. json.RootElement.GetProperty("alerts").EnumerateArray()];
        Assert.NotEmpty(alerts);
        Assert.All(alerts, a => Assert.True(Opened(a) > LaundryScenario.Break, $"{a.GetProperty("check")} opened at {Opened(a):O}, before the change"));
        JsonElement coefficients = Assert.Single(alerts, a => a.GetProperty("check").GetString() == "coefficients" && a.GetProperty("subject").ValueKind == JsonValueKind.Null);
        Assert.Equal("critical", coefficients.GetProperty("severity").GetString());
        // Per-window tests must be critical in 2 of the last 3 windows; the 14:00 slot's window is the first wholly
        // after the change, so the alert opens by 16:00 at the latest.
        Assert.True(Opened(coefficients) <= LaundryScenario.Break.AddHours(4), $"opened only at {Opened(coefficients):O}");
        // The residual CUSUM needs no repetition: it opens on the first window that holds changed rows.
        JsonElement cusum = Assert.Single(alerts, a => a.GetProperty("check").GetString() == "residuals");
        Assert.Equal(LaundryScenario.Break.AddHours(1), Opened(cusum));
        Assert.Equal(JsonValueKind.Null, coefficients.GetProperty("resolved_at").ValueKind);
    }

    [Fact]
    public async Task The_json_has_exactly_the_documented_fields()
    {
        CliRun run = await Backtest("--format", "json");

        using JsonDocument json = JsonDocument.Parse(run.Output);
        Assert.Equal(["model", "windows", "alerts"], Names(json.RootElement));
        Assert.Equal(LaundryScenario.Key, json.RootElement.GetProperty("model").GetString());
        JsonElement[] windows = [.. json.RootElement.GetProperty("windows").EnumerateArray()];
        Assert.Equal(24, windows.Length);
        Assert.All(windows, w => Assert.Equal(["start", "end", "status", "findings"], Names(w)));
        Assert.Equal("2026-02-01T22:00:00Z", windows[0].GetProperty("start").GetString());
        Assert.Equal("2026-02-02T00:00:00Z", windows[0].GetProperty("end").GetString());
        Assert.All(windows, w => Assert.Equal("ok", w.GetProperty("status").GetString()));
        JsonElement finding = windows.SelectMany(w => w.GetProperty("findings").EnumerateArray()).First();
        Assert.Equal(["check", "subject", "severity", "statistic", "value", "threshold", "p_value", "alpha", "limit", "explanation"], Names(finding));
        Assert.All(json.RootElement.GetProperty("alerts").EnumerateArray(), a => Assert.Equal(["check", "subject", "severity", "opened_at", "resolved_at"], Names(a)));
    }

    [Fact]
    public async Task A_backtest_writes_nothing()
    {
        string before = await LaundryScenario.StoredCountsAsync(database);

        CliRun run = await Backtest();

        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Equal(before, await LaundryScenario.StoredCountsAsync(database));
        Assert.Contains("nothing was written", run.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task The_table_lists_the_windows_then_the_alert_timeline()
    {
        CliRun run = await Backtest();

        string[] lines = run.Output.Split('\n');
        Assert.StartsWith("backtest of laundry-cycles: 24 window(s), slots 2026-02-02T00:00:00Z to 2026-02-02T23:00:00Z every 1h", lines[0], StringComparison.Ordinal);
        Assert.Contains(lines, l => l.StartsWith("SLOT ", StringComparison.Ordinal) && l.Contains("WORST", StringComparison.Ordinal));
        int timeline = Array.FindIndex(lines, l => l.EndsWith("alert(s) would have opened:", StringComparison.Ordinal));
        Assert.True(timeline > 24, run.Output);
        Assert.Contains(lines.Skip(timeline), l => l.StartsWith("coefficients ", StringComparison.Ordinal) && l.Contains("critical", StringComparison.Ordinal) && l.Contains("still open", StringComparison.Ordinal));
    }

    [Fact]
    public async Task Every_sets_the_step_between_slots()
    {
        CliRun run = await Backtest("--every", "3h", "--format", "json");

        using JsonDocument json = JsonDocument.Parse(run.Output);
        Assert.Equal(8, json.RootElement.GetProperty("windows").GetArrayLength());
    }

    [Theory]
    [InlineData("--from", "yesterday", "--from: 'yesterday' is not a time; use RFC 3339")]
    [InlineData("--every", "often", "--every: 'often' is not a duration")]
    [InlineData("--to", "2026-02-01T00:00:00Z", "--to (2026-02-01T00:00:00Z) is before --from (2026-02-02T00:00:00Z)")]
    public async Task A_bad_time_or_step_is_a_usage_error(string option, string value, string message)
    {
        var args = new Dictionary<string, string> { ["--from"] = "2026-02-02T00:00:00Z", ["--to"] = "2026-02-02T23:00:00Z", [option] = value };

        CliRun run = await LaundryScenario.Cli(database, ["backtest", LaundryScenario.Key, .. args.SelectMany(a => new[] { a.Key, a.Value })]);

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_unknown_model_is_a_runtime_error_that_names_it()
    {
        CliRun run = await LaundryScenario.Cli(database, "backtest", "no-such-model", "--from", "2026-02-02T00:00:00Z", "--to", "2026-02-02T23:00:00Z");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("modelwatch backtest: no model 'no-such-model'", run.Error, StringComparison.Ordinal);
    }

    private Task<CliRun> Backtest(params string[] extra) =>
        LaundryScenario.Cli(database, ["backtest", LaundryScenario.Key, "--from", "2026-02-02T00:00:00Z", "--to", "2026-02-02T23:00:00Z", .. extra]);

    private static DateTimeOffset Opened(JsonElement alert) =>
        DateTimeOffset.Parse(alert.GetProperty("opened_at").GetString()!, System.Globalization.CultureInfo.InvariantCulture);

    private static string[] Names(JsonElement element) => [.. element.EnumerateObject().Select(p => p.Name)];
}
