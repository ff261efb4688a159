using System.Text.Json;
using Dapper;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Alerts;

/// <summary>
/// <c>runs list</c> and <c>alerts list|show|ack|resolve|silence</c> end to end on a real PostgreSQL, over a run and an
/// alert written the way the daemon writes them (invented model: a florist's delivery minutes).
/// </summary>
public sealed class AlertAndRunCommandTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IAsyncLifetime
{
    private long _runId;
    private DateTimeOffset _slot;
    private long _alertId;

    public async Task InitializeAsync()
    {
        Assert.Equal(0, (await Cli("migrate")).ExitCode);
        string folder = Directory.CreateTempSubdirectory("mw-cli-alerts-").FullName;
        await File.WriteAllTextAsync(Path.Combine(folder, "florist-minutes.yaml"), """
            key: florist-minutes
            query: SELECT at, km, minutes FROM bouquets WHERE at >= @window_start AND at < @window_end
            time_column: at
            outcome: minutes
            features: [km]
            schedule: 1h
            window: 1d
            notify: [florist-pager]
            """);
        Assert.Equal(0, (await Cli("model", "apply", Path.Combine(folder, "florist-minutes.yaml"))).ExitCode);
        Directory.Delete(folder, recursive: true);
        await using NpgsqlConnection connection = await database.DataSource.OpenConnectionAsync();

        // xunit makes a class instance per test over one database: each instance records its own slot.
        long earlier = await connection.QuerySingleAsync<long>("SELECT count(*) FROM modelwatch.run");
        _slot = new DateTimeOffset(2026, 5, 2, 6, 0, 0, TimeSpan.Zero).AddHours(earlier);
        _runId = await connection.QuerySingleAsync<long>("""
            INSERT INTO modelwatch.run (model_key, slot, window_start, window_end, rows_read, status, stage_timings, worker_id, started_at, finished_at)
            VALUES ('florist-minutes', @slot, @start, @slot, 240, 'ok',
                    '{"read": 0.012, "fit": 0.001, "checks": 0.004}', 'replica-a', @slot, @slot)
            RETURNING id
            """, new { slot = _slot, start = _slot.AddDays(-1) });
        await connection.ExecuteAsync("UPDATE modelwatch.alert SET state = 'resolved', resolved_at = opened_at, resolved_by = 'setup' WHERE state <> 'resolved'");
        _alertId = await connection.QuerySingleAsync<long>("""
            INSERT INTO modelwatch.alert (model_key, check_name, subject, severity, state, opened_at, opened_by, first_run_id, last_run_id)
            VALUES ('florist-minutes', 'coefficients', NULL, 'critical', 'open', '2026-05-02T06:00:02Z', 'daemon:replica-a', @run, @run)
            RETURNING id
            """, new { run = _runId });
        await connection.ExecuteAsync("""
            INSERT INTO modelwatch.alert_event (alert_id, transition, severity, state, run_id, actor, at, statistic, value, threshold, explanation)
            VALUES (@alert, 'opened', 'critical', 'open', @run, 'daemon:replica-a', '2026-05-02T06:00:02Z', 'wald', 48.2, 2.3e-5, 'coefficients moved: Wald 48.2')
            """, new { alert = _alertId, run = _runId });
    }

    public Task DisposeAsync() => Task.CompletedTask;

    [Fact]
    public async Task Runs_list_prints_the_documented_json_fields()
    {
        CliRun run = await Cli("runs", "list", "florist-minutes", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using JsonDocument json = JsonDocument.Parse(run.Output);
        JsonElement first = json.RootElement.EnumerateArray().Single(r => r.GetProperty("id").GetInt64() == _runId);
        Assert.Equal(
            ["id", "model", "slot", "window", "status", "reason", "baseline_version", "rows_read", "rows_rejected", "worker", "started_at", "finished_at", "timings"],
            first.EnumerateObject().Select(p => p.Name));
        Assert.Equal(_slot.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", System.Globalization.CultureInfo.InvariantCulture), first.GetProperty("slot").GetString());
        Assert.Equal(_slot.AddDays(-1).ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", System.Globalization.CultureInfo.InvariantCulture), first.GetProperty("window").GetProperty("start").GetString());
        Assert.Equal(0.012, first.GetProperty("timings").GetProperty("read").GetDouble());
        Assert.Equal("replica-a", first.GetProperty("worker").GetString());
    }

    [Fact]
    public async Task An_alert_is_listed_shown_acknowledged_and_resolved_with_its_actor()
    {
        CliRun list = await Cli("alerts", "list", "--format", "json");
        CliRun ack = await Cli("alerts", "ack", Id(), "--actor", "dana", "--note", "checking the new delivery zones");
        CliRun ackAgain = await Cli("alerts", "ack", Id(), "--actor", "dana");
        CliRun resolve = await Cli("alerts", "resolve", Id(), "--actor", "dana", "--note", "zones re-mapped\u001b[2J\u001b]0;pwned\u0007\r\nfake line; baseline refitted");
        CliRun show = await Cli("alerts", "show", Id(), "--format", "json");
        CliRun text = await Cli("alerts", "show", Id());
        CliRun unresolved = await Cli("alerts", "list", "--format", "json");

        using JsonDocument listed = JsonDocument.Parse(list.Output);
        JsonElement alert = listed.RootElement.EnumerateArray().Single(a => a.GetProperty("id").GetInt64() == _alertId);
        Assert.Equal(JsonValueKind.Null, alert.GetProperty("subject").ValueKind);
        Assert.Equal("wald", alert.GetProperty("statistic").GetString());
        Assert.Equal(48.2, alert.GetProperty("value").GetDouble());
        Assert.Equal(0, ack.ExitCode);
        Assert.Equal(ExitCodes.RuntimeError, ackAgain.ExitCode);
        Assert.Contains("is acknowledged", ackAgain.Error, StringComparison.Ordinal);
        Assert.Equal(0, resolve.ExitCode);
        using JsonDocument shown = JsonDocument.Parse(show.Output);
        Assert.Equal("resolved", shown.RootElement.GetProperty("state").GetString());
        Assert.Equal("dana", shown.RootElement.GetProperty("acknowledged_by").GetString());
        Assert.Equal("dana", shown.RootElement.GetProperty("resolved_by").GetString());
        Assert.Equal(["opened", "acknowledged", "resolved"], shown.RootElement.GetProperty("history").EnumerateArray().Select(h => h.GetProperty("transition").GetString()));

        // The note is kept as given, and JSON escapes it; printed as text, its control characters are written out, not sent.
        Assert.Equal("zones re-mapped\u001b[2J\u001b]0;pwned\u0007\r\nfake line; baseline refitted", shown.RootElement.GetProperty("note").GetString());
        Assert.Contains("note: zones re-mapped\\x1b[2J\\x1b]0;pwned\\x07\\x0d\\x0afake line; baseline refitted", text.Output, StringComparison.Ordinal);
        Assert.DoesNotContain('\u001b', text.Output);

        // The engineer's transitions queued a notification for the model's target; no daemon runs here to send it.
        JsonElement acknowledged = shown.RootElement.GetProperty("history")[1];
        JsonElement queued = Assert.Single(acknowledged.GetProperty("notifications").EnumerateArray());
        Assert.Equal(["target", "state", "detail", "attempts", "finished_at"], queued.EnumerateObject().Select(p => p.Name));
        Assert.Equal("florist-pager", queued.GetProperty("target").GetString());
        Assert.Equal("pending", queued.GetProperty("state").GetString());
        Assert.Equal(0, queued.GetProperty("attempts").GetInt32());
        using JsonDocument remaining = JsonDocument.Parse(unresolved.Output);
        Assert.DoesNotContain(remaining.RootElement.EnumerateArray(), a => a.GetProperty("id").GetInt64() == _alertId);
    }

    [Fact]
    public async Task A_silence_needs_a_future_end_and_a_reason()
    {
        CliRun past = await Cli("alerts", "silence", "florist-minutes", "--until", "2020-01-01T00:00:00Z", "--reason", "late");
        CliRun noReason = await Cli("alerts", "silence", "florist-minutes", "--until", "2099-01-01T00:00:00Z");
        CliRun ok = await Cli("alerts", "silence", "florist-minutes", "--check", "features", "--until", "2099-01-01T00:00:00+02:00", "--reason", "supplier change week");

        Assert.Equal(ExitCodes.RuntimeError, past.ExitCode);
        Assert.Contains("not in the future", past.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Usage, noReason.ExitCode);
        Assert.Equal(0, ok.ExitCode);
        Assert.Contains("stop until 2098-12-31T22:00:00Z", ok.Output, StringComparison.Ordinal);
        await using NpgsqlConnection connection = await database.DataSource.OpenConnectionAsync();
        Assert.Equal("supplier change week", await connection.QuerySingleAsync<string>("SELECT reason FROM modelwatch.silence WHERE model_key = 'florist-minutes' AND check_name = 'features'"));
    }

    [Fact]
    public async Task Failed_notifications_of_an_alert_are_queued_again_on_request()
    {
        // The engineer's ack queues one notification for the model's target; pretend the target refused it.
        Assert.Equal(0, (await Cli("alerts", "ack", Id(), "--actor", "dana")).ExitCode);
        await using NpgsqlConnection connection = await database.DataSource.OpenConnectionAsync();
        await connection.ExecuteAsync("UPDATE modelwatch.notification SET state = 'failed', detail = 'HTTP 503', finished_at = now() WHERE alert_id = @id", new { id = _alertId });

        CliRun neither = await Cli("alerts", "resend");
        CliRun otherTarget = await Cli("alerts", "resend", Id(), "--target", "someone-else");
        CliRun resend = await Cli("alerts", "resend", Id());
        CliRun unknown = await Cli("alerts", "resend", "987654321");

        Assert.Equal(ExitCodes.Usage, neither.ExitCode);
        Assert.Contains("0 notification(s) queued again", otherTarget.Output, StringComparison.Ordinal);
        Assert.Equal(0, resend.ExitCode);
        Assert.Contains("1 notification(s) queued again", resend.Output, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, unknown.ExitCode);
        var row = await connection.QuerySingleAsync<(string State, string? Detail)>("SELECT state, detail FROM modelwatch.notification WHERE alert_id = @id", new { id = _alertId });
        Assert.Equal(("pending", null), row);
    }

    [Fact]
    public async Task An_unknown_alert_is_a_runtime_error()
    {
        CliRun run = await Cli("alerts", "show", "987654321");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("alert 987654321 does not exist", run.Error, StringComparison.Ordinal);
    }

    private string Id() => _alertId.ToString(System.Globalization.CultureInfo.InvariantCulture);

    private Task<CliRun> Cli(params string[] args) => CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);
}
