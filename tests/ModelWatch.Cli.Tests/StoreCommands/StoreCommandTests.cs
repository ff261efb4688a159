using System.Globalization;
using System.Text;
using System.Text.Json;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.StoreCommands;

/// <summary>
/// The store commands end to end on a real PostgreSQL: migrate, model apply/list/show/validate, baseline fit/import.
/// Invented data: a courier's delivery minutes by distance and stops.
/// </summary>
public sealed class StoreCommandTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private const int Rows = 400;
    private readonly string _specs = Directory.CreateTempSubdirectory("mw-cli-specs-").FullName;

    public async Task InitializeAsync()
    {
        await using NpgsqlCommand create = database.DataSource.CreateCommand($"""
            CREATE TABLE IF NOT EXISTS trips (at timestamptz NOT NULL, distance_km float8, stops int4, minutes float8, label text);
            TRUNCATE trips;
            INSERT INTO trips SELECT timestamptz '2026-03-01 00:00:00+00' + g * interval '1 minute',
                   (g % 37) / 3.0 + 1, (g * 5) % 9, 5 + 2.2 * ((g % 37) / 3.0 + 1) + 2.9 * ((g * 5) % 9) + cos(g * 0.9), 'x'
            FROM generate_series(0, {Rows - 1}) g;
            """);
        await create.ExecuteNonQueryAsync();
        Assert.Equal(0, (await Cli("migrate")).ExitCode);
    }

    public Task DisposeAsync()
    {
        Directory.Delete(_specs, recursive: true);
        return Task.CompletedTask;
    }

    [Fact]
    public async Task Migrate_twice_reports_the_schema_current()
    {
        CliRun run = await Cli("migrate");

        Assert.Equal(0, run.ExitCode);
        Assert.StartsWith("schema is current (version ", run.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Apply_list_and_show_a_folder_of_specs()
    {
        WriteSpec("cli-a.yaml", Spec("cli-a"));
        WriteSpec("cli-b.yaml", Spec("cli-b"));

        CliRun apply = await Cli("model", "apply", _specs);
        CliRun list = await Cli("model", "list", "--format", "json");
        CliRun show = await Cli("model", "show", "cli-a", "--format", "json");
        CliRun table = await Cli("model", "show", "cli-b");

        Assert.Equal(0, apply.ExitCode);
        Assert.Contains("cli-a: created (no baseline yet", apply.Output, StringComparison.Ordinal);
        Assert.Equal(0, list.ExitCode);
        using JsonDocument models = JsonDocument.Parse(list.Output);
        Assert.Contains(models.RootElement.EnumerateArray(), m => m.GetProperty("key").GetString() == "cli-b" && m.GetProperty("baseline_version").ValueKind == JsonValueKind.Null);
        using JsonDocument one = JsonDocument.Parse(show.Output);
        Assert.Equal("minutes", one.RootElement.GetProperty("spec").GetProperty("outcome").GetString());
        Assert.Equal("skip-row", one.RootElement.GetProperty("spec").GetProperty("missing").GetString());
        Assert.Contains("design:    minutes ~ 1 + distance_km + stops", table.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_invalid_spec_lists_file_field_and_reason_and_writes_nothing()
    {
        string dir = Path.Combine(_specs, "invalid");
        Directory.CreateDirectory(dir);
        File.WriteAllText(Path.Combine(dir, "good.yaml"), Spec("cli-never"));
        File.WriteAllText(Path.Combine(dir, "x.yaml"), Spec("cli-never-x").Replace("window: 2h", "window: -2h", StringComparison.Ordinal));

        CliRun apply = await Cli("model", "apply", dir);

        Assert.Equal(ExitCodes.RuntimeError, apply.ExitCode);
        Assert.Contains("x.yaml: window: must be a positive duration such as 24h or 7d, not '-2h'", apply.Error, StringComparison.Ordinal);
        Assert.Contains("nothing was written", apply.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, (await Cli("model", "show", "cli-never")).ExitCode);
    }

    [Theory]
    [InlineData("checks:\n  drift:\n    alpha: 0.01", "checks.drift: unknown check 'drift' (checks: source, data, serving, coefficients")]
    [InlineData("checks:\n  coefficients:\n    alpha: 0.01", "checks.coefficients: unknown setting 'alpha'")]
    [InlineData("checks:\n  coefficients:\n    psi_warning: 0.2", "checks.coefficients: 'psi_warning' is a setting of the features check; write it under checks.features")]
    [InlineData("checks:\n  coefficients:\n    drift_impact_floor: lots", "checks.coefficients: drift_impact_floor: 'lots' is not a finite number")]
    [InlineData("checks:\n  features:\n    psi_critical: -1", "checks.features: psi_critical: -1 is outside 0–100")]
    public async Task Check_settings_are_validated_before_anything_is_written(string checks, string message)
    {
        string file = WriteSpec("cli-thresholds.yaml", Spec("cli-thresholds") + "\n" + checks + "\n");

        CliRun apply = await Cli("model", "apply", file);

        Assert.Equal(ExitCodes.RuntimeError, apply.ExitCode);
        Assert.Contains(message, apply.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, (await Cli("model", "show", "cli-thresholds")).ExitCode);
    }

    [Fact]
    public async Task Validate_reports_each_missing_or_mistyped_column()
    {
        string file = WriteSpec("cli-columns.yaml", Spec("cli-columns", "[distance_km, label, weather]"));

        CliRun run = await Cli("model", "validate", file);

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("model cli-columns: feature column 'label' has type text", run.Error, StringComparison.Ordinal);
        Assert.Contains("model cli-columns: feature column 'weather' is not in the query's result", run.Error, StringComparison.Ordinal);
        Assert.Contains("2 column problem(s)", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Baseline_fit_stores_a_version_and_validate_of_the_key_passes()
    {
        await Cli("model", "apply", WriteSpec("cli-fit.yaml", Spec("cli-fit")));

        CliRun fit = await Cli("baseline", "fit", "cli-fit", "--from", "2026-03-01T00:00:00Z", "--to", "2026-03-01T08:00:00+02:00");
        CliRun validate = await Cli("model", "validate", "cli-fit");
        CliRun list = await Cli("model", "list");

        Assert.Equal(0, fit.ExitCode);
        Assert.StartsWith("cli-fit: baseline version 1 (fitted, n = 360,", fit.Output, StringComparison.Ordinal);
        Assert.Equal(0, validate.ExitCode);
        Assert.Contains("cli-fit: spec valid", validate.Output, StringComparison.Ordinal);
        Assert.Contains(list.Output.Split('\n'), l => l.StartsWith("cli-fit ", StringComparison.Ordinal) && l.Contains(" v1 ", StringComparison.Ordinal));
    }

    [Fact]
    public async Task The_json_that_fit_prints_imports_as_a_baseline()
    {
        await Cli("model", "apply", WriteSpec("cli-import.yaml", Spec("cli-import")));
        string csv = Path.Combine(_specs, "trips.csv");
        var text = new StringBuilder("distance_km,stops,minutes\n");
        await using (NpgsqlCommand rows = database.DataSource.CreateCommand("SELECT distance_km, stops, minutes FROM trips ORDER BY at"))
        await using (NpgsqlDataReader reader = await rows.ExecuteReaderAsync())
        {
            while (await reader.ReadAsync())
            {
                text.Append(CultureInfo.InvariantCulture, $"{reader.GetDouble(0):R},{reader.GetInt32(1)},{reader.GetDouble(2):R}\n");
            }
        }

        await File.WriteAllTextAsync(csv, text.ToString());
        CliRun fit = await CliRun.InvokeAsync("fit", csv, "--target", "minutes", "--format", "json");
        string json = Path.Combine(_specs, "fit.json");
        await File.WriteAllTextAsync(json, fit.Output);

        CliRun import = await Cli("baseline", "import", "cli-import", json);
        CliRun again = await Cli("baseline", "import", "cli-import", json, "--from", "2026-03-01T00:00:00Z", "--to", "2026-03-01T06:40:00Z");

        Assert.Equal(0, fit.ExitCode);
        Assert.Equal(0, import.ExitCode);
        Assert.StartsWith($"cli-import: baseline version 1 (imported, n = {Rows},", import.Output, StringComparison.Ordinal);
        Assert.StartsWith($"cli-import: baseline version 2 (imported, n = {Rows},", again.Output, StringComparison.Ordinal);
        Assert.Contains($"{Rows} reference row(s) sampled", again.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Prune_disables_a_model_whose_file_is_gone()
    {
        string dir = Path.Combine(_specs, "prune");
        Directory.CreateDirectory(dir);
        File.WriteAllText(Path.Combine(dir, "keep.yaml"), Spec("cli-keep"));
        File.WriteAllText(Path.Combine(dir, "drop.yaml"), Spec("cli-drop"));
        Assert.Equal(0, (await Cli("model", "apply", dir)).ExitCode);
        File.Delete(Path.Combine(dir, "drop.yaml"));

        CliRun prune = await Cli("model", "apply", dir, "--prune");
        CliRun show = await Cli("model", "show", "cli-drop");

        Assert.Equal(0, prune.ExitCode);
        Assert.Contains("cli-drop: disabled", prune.Output, StringComparison.Ordinal);
        Assert.Contains("cli-keep: unchanged", prune.Output, StringComparison.Ordinal);
        Assert.StartsWith("model:     cli-drop (disabled)", show.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Prune_refuses_a_single_file()
    {
        CliRun run = await Cli("model", "apply", WriteSpec("cli-lonely.yaml", Spec("cli-lonely")), "--prune");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("--prune needs a folder of specs", run.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, (await Cli("model", "show", "cli-lonely")).ExitCode);
    }

    [Fact]
    public async Task Validate_names_an_unconfigured_data_source()
    {
        string file = WriteSpec("cli-elsewhere.yaml", Spec("cli-elsewhere") + "\nsource: warehouse\n");

        CliRun run = await Cli("model", "validate", file);

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("data source 'warehouse' is not configured: set Sources:warehouse:ConnectionString", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Baseline_fit_with_a_bad_time_says_which_option()
    {
        CliRun run = await Cli("baseline", "fit", "cli-a", "--from", "yesterday", "--to", "2026-03-02T00:00:00Z");

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains("--from: 'yesterday' is not a time; use RFC 3339", run.Error, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("garbage", "it is not a list of key=value pairs")]
    [InlineData("Host=127.0.0.1;Username=u;Pasword=hunter2-secret", "'pasword' is not a keyword Npgsql knows; check its spelling")]
    [InlineData("Host=127.0.0.1;Port=hunter2-secret", "the value of 'port' is not of the right kind")]
    public async Task A_connection_string_that_does_not_parse_is_one_line_that_never_repeats_it(string connectionString, string reason)
    {
        CliRun run = await CliRun.InvokeAsync("model", "list", "--database", connectionString);

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Equal($"modelwatch model list: ConnectionStrings:State (or --database): the connection string is not valid ({reason}); write key=value pairs separated by ';', such as Host=db.internal;Username=reader;Password=...;Database=sales", run.Error.Trim());
        Assert.DoesNotContain("hunter2", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_missing_state_database_is_a_clear_error()
    {
        CliRun run = await CliRun.InvokeAsync("model", "list", "--database", "Host=127.0.0.1;Port=1;Username=x;Timeout=2;Pooling=false");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.StartsWith("modelwatch model list: cannot reach the state database", run.Error, StringComparison.Ordinal);
    }

    private Task<CliRun> Cli(params string[] args) => CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);

    private string WriteSpec(string name, string yaml)
    {
        string path = Path.Combine(_specs, name);
        File.WriteAllText(path, yaml);
        return path;
    }

    private static string Spec(string key, string features = "[distance_km, stops]") => $"""
        key: {key}
        description: Courier trips (invented)
        query: SELECT at, distance_km, stops, minutes, label FROM trips WHERE at >= @window_start AND at < @window_end
        time_column: at
        outcome: minutes
        features: {features}
        schedule: 15m
        window: 2h
        min_rows: 30
        """;
}
