using System.Text.Json;
using System.Text.RegularExpressions;
using ModelWatch.Cli.Tests.Daemon;
using ModelWatch.Cli.Tests.Operations;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>
/// <c>check</c> and <c>backtest</c> run as their own processes with <c>COLUMNS</c> at 80 and 100 (the variable would
/// leak into other tests in-process): every line fits, every time is whole, explanations are shortened to one line and
/// whole in JSON.
/// </summary>
public sealed partial class TableWidthTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-table-width-").FullName;

    public Task InitializeAsync() => LaundryScenario.PrepareAsync(database, _folder);

    public Task DisposeAsync()
    {
        Directory.Delete(_folder, recursive: true);
        return Task.CompletedTask;
    }

    [Theory]
    [InlineData(80)]
    [InlineData(100)]
    public async Task Backtest_fits_the_width_without_splitting_a_time(int width)
    {
        string output = await RunAsync(width, "backtest", LaundryScenario.Key, "--from", "2026-02-02T00:00:00Z", "--to", "2026-02-02T23:00:00Z");

        string[] lines = output.Split('\n');
        string[] table = [.. lines.Skip(3)];
        Assert.All(table, l => Assert.True(l.TrimEnd('\r').Length <= width, $"{l.Length} > {width}: {l}"));
        Assert.Equal(Regex.Count(output, "20[0-9][0-9]-"), Time().Count(output));
        Assert.Contains(lines, l => l.StartsWith("2026-02-02T23:00:00Z", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData(80)]
    [InlineData(100)]
    public async Task Check_shortens_explanations_to_one_line_and_json_keeps_them_whole(int width)
    {
        string output = await RunAsync(width, "check", LaundryScenario.Key, "--at", "2026-02-02T15:00:00Z");
        string json = await RunAsync(width, "check", LaundryScenario.Key, "--at", "2026-02-02T15:00:00Z", "--format", "json");

        string[] lines = output.Split('\n');
        int header = Array.FindIndex(lines, l => l.StartsWith("CHECK ", StringComparison.Ordinal));
        string[] rows = [.. lines.Skip(header).TakeWhile(l => l.Trim().Length > 0)];
        Assert.All(rows, l => Assert.True(l.TrimEnd('\r').Length <= width, $"{l.Length} > {width}: {l}"));
        using JsonDocument document = JsonDocument.Parse(json);
        JsonElement[] findings = [.. document.RootElement.GetProperty("findings").EnumerateArray()];
        string explanation = findings[0].GetProperty("explanation").GetString()!;
        Assert.True(explanation.Length > width, "the scenario's first explanation should be longer than the terminal");
        // The explanation is on one line, shortened; the rest of it is in the JSON only.
        string shortened = Assert.Single(rows, l => l.Contains(explanation[..20], StringComparison.Ordinal)).TrimEnd();
        Assert.EndsWith("…", shortened, StringComparison.Ordinal);
        string shown = shortened[shortened.IndexOf(explanation[..20], StringComparison.Ordinal)..^1];
        Assert.StartsWith(shown.TrimEnd(), explanation, StringComparison.Ordinal);
        Assert.DoesNotContain(rows, l => l.Contains(explanation[^15..], StringComparison.Ordinal));
    }

    private async Task<string> RunAsync(int width, params string[] args)
    {
        using var process = ModelWatchProcess.Start(
            new Dictionary<string, string> { ["COLUMNS"] = width.ToString(System.Globalization.CultureInfo.InvariantCulture) },
            _folder,
            [.. args, "--database", database.ConnectionString]);
        int code = await process.ExitCodeAsync(TimeSpan.FromMinutes(2));
        Assert.True(code is ExitCodes.Ok or ExitCodes.Findings, process.Error);
        return process.Output;
    }

    [GeneratedRegex(@"20[0-9]{2}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}Z")]
    private static partial Regex Time();
}
