using System.Text.Json;
using ModelWatch.Cli.Commands;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Models;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Baselines;

/// <summary>
/// <c>baseline list|show|diff|activate</c> and superseding on a real PostgreSQL. Invented data: a courier's delivery
/// minutes by stops and distance; the spec lists <c>stops</c> before <c>distance_km</c>, so the spec's order is not the
/// alphabetical one.
/// </summary>
public sealed class BaselineLifecycleTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private const string Early = "2026-03-01T03:00:00Z";
    private const string Late = "2026-03-01T06:00:00Z";
    private readonly string _specs = Directory.CreateTempSubdirectory("mw-baseline-life-").FullName;

    public async Task InitializeAsync()
    {
        await using NpgsqlCommand create = database.DataSource.CreateCommand("""
            CREATE TABLE IF NOT EXISTS deliveries (at timestamptz NOT NULL, distance_km float8, stops int4, minutes float8);
            TRUNCATE deliveries;
            INSERT INTO deliveries SELECT timestamptz '2026-03-01 00:00:00+00' + g * interval '1 minute',
                   (g % 37) / 3.0 + 1, (g * 5) % 9, 5 + 2.2 * ((g % 37) / 3.0 + 1) + 2.9 * ((g * 5) % 9) + cos(g * 0.9)
            FROM generate_series(0, 479) g;
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
    public async Task List_shows_every_version_with_the_active_one_marked()
    {
        await TwoVersionsAsync("life-list");

        CliRun json = await Cli("baseline", "list", "life-list", "--format", "json");
        CliRun table = await Cli("baseline", "list", "life-list");

        Assert.Equal(0, json.ExitCode);
        using JsonDocument document = JsonDocument.Parse(json.Output);
        JsonElement root = document.RootElement;
        Assert.Equal(2, root.GetProperty("active_version").GetInt32());
        JsonElement[] versions = [.. root.GetProperty("versions").EnumerateArray()];
        Assert.Equal([1, 2], versions.Select(v => v.GetProperty("version").GetInt32()));
        Assert.Equal([false, true], versions.Select(v => v.GetProperty("active").GetBoolean()));
        Assert.All(versions, v => Assert.Equal("fitted", v.GetProperty("origin").GetString()));
        Assert.All(versions, v => Assert.Equal(StoreCommandRunner.Actor, v.GetProperty("created_by").GetString()));
        Assert.Equal([180L, 360L], versions.Select(v => v.GetProperty("row_count").GetInt64()));
        Assert.Equal(Early, versions[0].GetProperty("reference_window").GetProperty("end").GetString());
        Assert.All(versions, v => Assert.True(v.GetProperty("residual_sd").GetDouble() > 0));
        Assert.All(versions, v => Assert.True(v.GetProperty("condition_number").GetDouble() >= 1));
        string[] lines = table.Output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("VERSION  ACTIVE  ORIGIN", lines[0], StringComparison.Ordinal);
        Assert.Matches(@"^2\s+ACTIVE\s+fitted\s", lines[2]);
        Assert.Matches(@"^1\s+fitted\s", lines[1]);
    }

    [Fact]
    public async Task Show_prints_coefficients_in_the_spec_order_with_their_standard_errors()
    {
        await TwoVersionsAsync("life-show");

        CliRun json = await Cli("baseline", "show", "life-show", "--format", "json");
        CliRun table = await Cli("baseline", "show", "life-show", "--version", "1");

        Assert.Equal(0, json.ExitCode);
        using JsonDocument document = JsonDocument.Parse(json.Output);
        JsonElement root = document.RootElement;
        Assert.Equal(2, root.GetProperty("version").GetInt32());
        Assert.True(root.GetProperty("active").GetBoolean());
        Assert.Equal(357, root.GetProperty("residual_df").GetInt64());
        JsonElement[] terms = [.. root.GetProperty("coefficients").EnumerateArray()];
        Assert.Equal(["(intercept)", "stops", "distance_km"], terms.Select(t => t.GetProperty("term").GetString()));

        // The data are 5 + 2.2·distance + 2.9·stops + cos(0.9g): the estimates lie near the generating values.
        Assert.Equal(2.9, terms[1].GetProperty("estimate").GetDouble(), 0.1);
        Assert.Equal(2.2, terms[2].GetProperty("estimate").GetDouble(), 0.1);
        Assert.All(terms, t => Assert.True(t.GetProperty("std_error").GetDouble() > 0));
        Assert.Equal(360, root.GetProperty("reference_sample").GetProperty("rows_sampled").GetInt32());
        Assert.All(root.GetProperty("tests").EnumerateArray(), t => Assert.True(t.GetProperty("enabled").GetBoolean(), t.GetProperty("tests").GetString()));

        Assert.Equal(0, table.ExitCode);
        Assert.Contains("baseline:         version 1 (not active; version 2 is)", table.Output, StringComparison.Ordinal);
        int intercept = table.Output.IndexOf("\n(intercept) ", StringComparison.Ordinal);
        int stops = table.Output.IndexOf("\nstops ", StringComparison.Ordinal);
        int distance = table.Output.IndexOf("\ndistance_km ", StringComparison.Ordinal);
        Assert.True(intercept > 0 && intercept < stops && stops < distance, table.Output);
    }

    [Fact]
    public async Task Diff_gives_each_term_difference_in_standard_errors_of_the_first_version()
    {
        await TwoVersionsAsync("life-diff");
        using JsonDocument first = JsonDocument.Parse((await Cli("baseline", "show", "life-diff", "--version", "1", "--format", "json")).Output);
        using JsonDocument second = JsonDocument.Parse((await Cli("baseline", "show", "life-diff", "--version", "2", "--format", "json")).Output);

        CliRun diff = await Cli("baseline", "diff", "life-diff", "1", "2", "--format", "json");
        CliRun table = await Cli("baseline", "diff", "life-diff", "1", "2");

        Assert.Equal(0, diff.ExitCode);
        using JsonDocument document = JsonDocument.Parse(diff.Output);
        JsonElement[] terms = [.. document.RootElement.GetProperty("terms").EnumerateArray()];
        Assert.Equal(["(intercept)", "stops", "distance_km"], terms.Select(t => t.GetProperty("term").GetString()));
        JsonElement[] a = [.. first.RootElement.GetProperty("coefficients").EnumerateArray()];
        JsonElement[] b = [.. second.RootElement.GetProperty("coefficients").EnumerateArray()];
        for (int i = 0; i < terms.Length; i++)
        {
            double difference = b[i].GetProperty("estimate").GetDouble() - a[i].GetProperty("estimate").GetDouble();
            Assert.Equal(difference, terms[i].GetProperty("difference").GetDouble());
            Assert.Equal(difference / a[i].GetProperty("std_error").GetDouble(), terms[i].GetProperty("difference_in_se_of_a").GetDouble());
        }

        JsonElement sd = document.RootElement.GetProperty("residual_sd");
        Assert.Equal(second.RootElement.GetProperty("residual_sd").GetDouble() - first.RootElement.GetProperty("residual_sd").GetDouble(), sd.GetProperty("difference").GetDouble());
        Assert.True(document.RootElement.GetProperty("condition_number").GetProperty("b").GetDouble() >= 1);
        Assert.Contains("TERM         V1", table.Output, StringComparison.Ordinal);
        Assert.Contains("IN SE OF V1", table.Output, StringComparison.Ordinal);
        Assert.Contains("residual SD: ", table.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Activating_an_older_version_supersedes_alerts_raised_against_the_newer_one()
    {
        await TwoVersionsAsync("life-supersede", notify: "[ops-hook]");
        long runId = await RunAsync("life-supersede", baselineVersion: 2);
        long current = await AlertAsync("life-supersede", "coefficients", "stops", "open", runId, baselineVersion: 2);
        long legacy = await AlertAsync("life-supersede", "residuals", null, "acknowledged", runId, baselineVersion: null);
        await ExecuteAsync("""
            INSERT INTO modelwatch.alert_policy_state (model_key, check_name, subject, state, updated_at)
            VALUES ('life-supersede', 'coefficients', 'stops', '{"open": true, "recent": ["critical"], "consecutive_ok": 0}', now())
            """);

        CliRun activate = await Cli("baseline", "activate", "life-supersede", "1");

        Assert.Equal(0, activate.ExitCode);
        Assert.Contains("life-supersede: now watched against baseline 1 (was 2)", activate.Output, StringComparison.Ordinal);
        Assert.Contains("every check now compares the data with version 1", activate.Output, StringComparison.Ordinal);
        Assert.Contains($"alerts #{current}, #{legacy} superseded", activate.Output, StringComparison.Ordinal);
        foreach (long id in new[] { current, legacy })
        {
            Assert.Equal(1L, await CountAsync($"SELECT count(*) FROM modelwatch.alert WHERE id = {id} AND state = 'resolved' AND resolved_by = '{StoreCommandRunner.Actor}' AND resolved_at IS NOT NULL"));
            Assert.Equal(1L, await CountAsync(
                $"SELECT count(*) FROM modelwatch.alert_event WHERE alert_id = {id} AND transition = 'superseded' AND state = 'resolved' AND explanation = 'superseded: model now watched against baseline 1 (was 2)'"));
            Assert.Equal(1L, await CountAsync(
                $"SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert_event e ON e.id = n.alert_event_id WHERE n.alert_id = {id} AND e.transition = 'superseded' AND n.target = 'ops-hook' AND n.state = 'pending'"));
        }

        Assert.Equal(1L, await CountAsync("SELECT count(*) FROM modelwatch.alert_policy_state WHERE model_key = 'life-supersede' AND state ->> 'open' = 'false' AND jsonb_array_length(state -> 'recent') = 0"));
        Assert.Equal(1L, await CountAsync("SELECT active_baseline_version FROM modelwatch.model WHERE key = 'life-supersede'"));
        CliRun history = await Cli("alerts", "show", current.ToString(System.Globalization.CultureInfo.InvariantCulture));
        Assert.Contains("superseded", history.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Keep_alerts_leaves_them_open_and_names_them()
    {
        await TwoVersionsAsync("life-keep", notify: "[ops-hook]");
        long runId = await RunAsync("life-keep", baselineVersion: 2);
        long alert = await AlertAsync("life-keep", "coefficients", "stops", "open", runId, baselineVersion: 2);

        CliRun activate = await Cli("baseline", "activate", "life-keep", "1", "--keep-alerts");

        Assert.Equal(0, activate.ExitCode);
        Assert.Contains($"alert #{alert} raised against another baseline left open (--keep-alerts)", activate.Output, StringComparison.Ordinal);
        Assert.Equal(1L, await CountAsync($"SELECT count(*) FROM modelwatch.alert WHERE id = {alert} AND state = 'open'"));
        Assert.Equal(0L, await CountAsync($"SELECT count(*) FROM modelwatch.alert_event WHERE alert_id = {alert}"));
        Assert.Equal(0L, await CountAsync($"SELECT count(*) FROM modelwatch.notification WHERE alert_id = {alert}"));
        Assert.Equal(1L, await CountAsync("SELECT active_baseline_version FROM modelwatch.model WHERE key = 'life-keep'"));
    }

    [Fact]
    public async Task A_new_fit_becomes_active_and_supersedes_alerts_of_the_pinned_version()
    {
        await TwoVersionsAsync("life-refit");
        Assert.Equal(0, (await Cli("baseline", "activate", "life-refit", "1")).ExitCode);
        long runId = await RunAsync("life-refit", baselineVersion: 1);
        long alert = await AlertAsync("life-refit", "features", "stops", "open", runId, baselineVersion: 1);

        CliRun fit = await Cli("baseline", "fit", "life-refit", "--from", "2026-03-01T00:00:00Z", "--to", "2026-03-01T07:00:00Z");

        Assert.Equal(0, fit.ExitCode);
        Assert.StartsWith("life-refit: baseline version 3 (fitted, n = 420,", fit.Output, StringComparison.Ordinal);
        Assert.Contains($"alert #{alert} superseded", fit.Output, StringComparison.Ordinal);
        Assert.Equal(3L, await CountAsync("SELECT active_baseline_version FROM modelwatch.model WHERE key = 'life-refit'"));
        Assert.Equal(1L, await CountAsync(
            $"SELECT count(*) FROM modelwatch.alert_event WHERE alert_id = {alert} AND transition = 'superseded' AND explanation = 'superseded: model now watched against baseline 3 (was 1)'"));
    }

    [Fact]
    public async Task The_activated_older_version_is_the_current_baseline_and_runs_use_it()
    {
        await TwoVersionsAsync("life-current");
        Assert.Equal(0, (await Cli("baseline", "activate", "life-current", "1")).ExitCode);

        ModelRecord? model = await new ModelRepository(database.DataSource, TimeProvider.System, StoreCommandRunner.CommandTimeout).GetAsync("life-current", CancellationToken.None);
        StoredBaseline? current = await new BaselineRepository(database.DataSource, TimeProvider.System, StoreCommandRunner.CommandTimeout).GetCurrentAsync("life-current", CancellationToken.None);
        CliRun check = await Cli("check", "life-current", "--at", "2026-03-01T07:00:00Z", "--record");
        CliRun modelShow = await Cli("model", "show", "life-current");

        Assert.Equal(1, model!.BaselineVersion);
        Assert.True(model.HasCompatibleBaseline);
        Assert.Equal(1, current!.Version);
        Assert.True(check.ExitCode is 0 or 1, check.Error);
        Assert.Equal(1L, await CountAsync("SELECT count(*) FROM modelwatch.run WHERE model_key = 'life-current' AND baseline_version = 1"));
        Assert.Equal(0L, await CountAsync("SELECT count(*) FROM modelwatch.run WHERE model_key = 'life-current' AND baseline_version <> 1"));
        Assert.Contains("baseline:  version 1", modelShow.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Import_without_a_reference_sample_warns_which_tests_it_disables()
    {
        await Cli("model", "apply", WriteSpec("life-import"));
        string file = Path.Combine(_specs, "life-import.json");
        await File.WriteAllTextAsync(file, """{ "coefficients": { "distance_km": 2.5, "(intercept)": 4.0, "stops": 3.0 }, "n": 5000, "residual_sd": 2.0 }""");

        CliRun import = await Cli("baseline", "import", "life-import", file);

        Assert.Equal(0, import.ExitCode);
        Assert.Contains("life-import baseline version 1 has no reference sample", import.Error, StringComparison.Ordinal);
        Assert.Contains("residuals: shape (Kolmogorov–Smirnov, Anderson–Darling) and spread (Brown–Forsythe)", import.Error, StringComparison.Ordinal);
        Assert.Contains("coefficients: Chow test; error: Chow's predictive F", import.Error, StringComparison.Ordinal);
        Assert.Contains("features: population stability index and bin-share CUSUMs", import.Error, StringComparison.Ordinal);
        Assert.Contains("features: extrapolation (leverage exceedance)", import.Error, StringComparison.Ordinal);
        Assert.Contains("the file carries no coefficient covariance, so these tests will be skipped: coefficients: Wald test; residuals: bias test", import.Error, StringComparison.Ordinal);
        string[] lines = import.Output.Split('\n');
        Assert.Equal(["(intercept)", "stops", "distance_km"], lines.Skip(1).Take(3).Select(l => l.Trim().Split(' ')[0]));
    }

    [Fact]
    public async Task Unknown_models_and_versions_are_runtime_errors_naming_what_exists()
    {
        await TwoVersionsAsync("life-unknown");

        CliRun model = await Cli("baseline", "list", "ghost");
        CliRun show = await Cli("baseline", "show", "life-unknown", "--version", "9");
        CliRun diff = await Cli("baseline", "diff", "life-unknown", "1", "7");
        CliRun activate = await Cli("baseline", "activate", "life-unknown", "5");

        Assert.Equal(ExitCodes.RuntimeError, model.ExitCode);
        Assert.Contains("no model 'ghost'", model.Error, StringComparison.Ordinal);
        foreach ((CliRun run, int version) in new[] { (show, 9), (diff, 7), (activate, 5) })
        {
            Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
            Assert.Contains($"model life-unknown has no baseline version {version} (versions: 1, 2)", run.Error, StringComparison.Ordinal);
        }

        Assert.Equal(2L, await CountAsync("SELECT COALESCE(active_baseline_version, 0) FROM modelwatch.model WHERE key = 'life-unknown'"));
    }

    private async Task TwoVersionsAsync(string key, string notify = "[]")
    {
        Assert.Equal(0, (await Cli("model", "apply", WriteSpec(key, notify))).ExitCode);
        Assert.Equal(0, (await Cli("baseline", "fit", key, "--from", "2026-03-01T00:00:00Z", "--to", Early)).ExitCode);
        Assert.Equal(0, (await Cli("baseline", "fit", key, "--from", "2026-03-01T00:00:00Z", "--to", Late)).ExitCode);
    }

    private async Task<long> RunAsync(string key, int baselineVersion)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand("""
            INSERT INTO modelwatch.run (model_key, slot, baseline_version, status, worker_id, started_at)
            VALUES ($1, timestamptz '2026-03-01 08:00:00+00', $2, 'ok', 'test', now()) RETURNING id
            """);
        command.Parameters.AddWithValue(key);
        command.Parameters.AddWithValue(baselineVersion);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private async Task<long> AlertAsync(string key, string check, string? subject, string state, long runId, int? baselineVersion)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand("""
            INSERT INTO modelwatch.alert (model_key, check_name, subject, severity, state, opened_at, opened_by, acknowledged_at, acknowledged_by,
                                          first_run_id, last_run_id, baseline_version)
            VALUES ($1, $2, $3, 'warning', $4, now(), 'daemon:test', CASE WHEN $4 = 'acknowledged' THEN now() END,
                    CASE WHEN $4 = 'acknowledged' THEN 'someone' END, $5, $5, $6) RETURNING id
            """);
        command.Parameters.AddWithValue(key);
        command.Parameters.AddWithValue(check);
        command.Parameters.AddWithValue((object?)subject ?? DBNull.Value);
        command.Parameters.AddWithValue(state);
        command.Parameters.AddWithValue(runId);
        command.Parameters.Add(new NpgsqlParameter { Value = (object?)baselineVersion ?? DBNull.Value, NpgsqlDbType = NpgsqlTypes.NpgsqlDbType.Integer });
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private async Task ExecuteAsync(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        await command.ExecuteNonQueryAsync();
    }

    private async Task<long> CountAsync(string sql)
    {
        await using NpgsqlCommand command = database.DataSource.CreateCommand(sql);
        return Convert.ToInt64(await command.ExecuteScalarAsync(), System.Globalization.CultureInfo.InvariantCulture);
    }

    private Task<CliRun> Cli(params string[] args) => CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);

    private string WriteSpec(string key, string notify = "[]")
    {
        string path = Path.Combine(_specs, key + ".yaml");
        File.WriteAllText(path, $"""
            key: {key}
            description: Courier deliveries (invented)
            query: SELECT at, stops, distance_km, minutes FROM deliveries WHERE at >= @window_start AND at < @window_end
            time_column: at
            outcome: minutes
            features: [stops, distance_km]
            schedule: 15m
            window: 2h
            min_rows: 30
            notify: {notify}
            """);
        return path;
    }
}
