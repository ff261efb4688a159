using System.Text.Json;
using Dapper;
using ModelWatch.Testing.Postgres;
using Npgsql;

namespace ModelWatch.Cli.Tests.Alerts;

/// <summary>
/// <c>runs list</c>, <c>alerts list|show|ack|resolve|resend</c>, <c>quiet</c> and <c>status</c> end to end on a real PostgreSQL, over a run and an
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
        Assert.Equal($"alert #{_alertId} acknowledged by person:dana", ack.Output.Trim());

        // Acknowledging twice changes nothing and says who was first; so does resolving a resolved alert.
        Assert.Equal(0, ackAgain.ExitCode);
        Assert.Matches($@"^alert #{_alertId} already acknowledged by person:dana at \d{{4}}-\d\d-\d\dT\d\d:\d\d:\d\dZ$", ackAgain.Output.Trim());
        Assert.Equal(0, resolve.ExitCode);
        CliRun resolveAgain = await Cli("alerts", "resolve", Id());
        Assert.Equal(0, resolveAgain.ExitCode);
        Assert.StartsWith($"alert #{_alertId} already resolved by person:dana at ", resolveAgain.Output, StringComparison.Ordinal);
        using JsonDocument shown = JsonDocument.Parse(show.Output);
        Assert.Equal("resolved", shown.RootElement.GetProperty("state").GetString());
        Assert.Equal("person:dana", shown.RootElement.GetProperty("acknowledged_by").GetString());
        Assert.Equal("person:dana", shown.RootElement.GetProperty("resolved_by").GetString());
        Assert.Equal("critical", shown.RootElement.GetProperty("opening").GetProperty("severity").GetString());
        Assert.Equal("coefficients moved: Wald 48.2", shown.RootElement.GetProperty("opening").GetProperty("explanation").GetString());
        Assert.Equal(JsonValueKind.Null, shown.RootElement.GetProperty("previous_alert").ValueKind);
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
    public async Task A_quiet_period_needs_a_known_model_and_check_a_future_end_and_a_reason_and_can_be_listed_and_ended()
    {
        CliRun past = await Cli("quiet", "florist-minutes", "--until", "2020-01-01T00:00:00Z", "--reason", "late");
        CliRun noReason = await Cli("quiet", "florist-minutes", "--until", "2099-01-01T00:00:00Z");
        CliRun both = await Cli("quiet", "florist-minutes", "--for", "2h", "--until", "2099-01-01T00:00:00Z", "--reason", "x");
        CliRun badLength = await Cli("quiet", "florist-minutes", "--for", "two hours", "--reason", "x");
        CliRun unknownModel = await Cli("quiet", "florist-minute", "--for", "2h", "--reason", "x");
        CliRun unknownCheck = await Cli("quiet", "florist-minutes", "--check", "feature", "--for", "2h", "--reason", "x");
        CliRun ok = await Cli("quiet", "florist-minutes", "--check", "features", "--until", "2099-01-01T00:00:00+02:00", "--reason", "supplier change week", "--actor", "dana");
        CliRun forTwoHours = await Cli("quiet", "florist-minutes", "--for", "2h", "--reason", "router swap");

        Assert.Equal(ExitCodes.Usage, past.ExitCode);
        Assert.Contains("not in the future", past.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Usage, noReason.ExitCode);
        Assert.Equal(ExitCodes.Usage, both.ExitCode);
        Assert.Equal(ExitCodes.Usage, badLength.ExitCode);
        Assert.Equal(ExitCodes.RuntimeError, unknownModel.ExitCode);
        Assert.Contains("no model 'florist-minute'; did you mean 'florist-minutes'?", unknownModel.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, unknownCheck.ExitCode);
        Assert.Contains("no check 'feature'; the checks are source, data, serving, coefficients, collinearity, residuals, error, features", unknownCheck.Error, StringComparison.Ordinal);
        Assert.Equal(0, ok.ExitCode);
        Assert.Contains("held until 2098-12-31T22:00:00Z (set by person:dana)", ok.Output, StringComparison.Ordinal);
        Assert.Equal(0, forTwoHours.ExitCode);
        long id = long.Parse(System.Text.RegularExpressions.Regex.Match(forTwoHours.Output, @"quiet period (\d+)").Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);

        // In force: listed, shown on the model, in the fleet status and beside the model's alerts.
        CliRun list = await Cli("quiet", "list", "--model", "florist-minutes", "--format", "json");
        using (JsonDocument listed = JsonDocument.Parse(list.Output))
        {
            Assert.Contains(listed.RootElement.GetProperty("quiet_periods").EnumerateArray(), q => q.GetProperty("id").GetInt64() == id && q.GetProperty("state").GetString() == "active" && q.GetProperty("reason").GetString() == "router swap");
        }

        Assert.Contains("router swap", (await Cli("model", "show", "florist-minutes")).Output, StringComparison.Ordinal);
        using (JsonDocument status = JsonDocument.Parse((await Cli("status", "--format", "json")).Output))
        {
            JsonElement florist = status.RootElement.GetProperty("models").EnumerateArray().Single(m => m.GetProperty("key").GetString() == "florist-minutes");
            Assert.Equal("2098-12-31T22:00:00Z", florist.GetProperty("quiet_until").GetString());
        }

        // The coefficients alert is held by the two-hour period of the whole model, not by the features-only one.
        using (JsonDocument alerts = JsonDocument.Parse((await Cli("alerts", "list", "florist-minutes", "--format", "json")).Output))
        {
            string? held = alerts.RootElement.EnumerateArray().Single(a => a.GetProperty("id").GetInt64() == _alertId).GetProperty("quiet_until").GetString();
            Assert.NotNull(held);
            Assert.NotEqual("2098-12-31T22:00:00Z", held);
        }

        // Ended early; ending twice says so; an unknown number is an error.
        CliRun end = await Cli("quiet", "end", id.ToString(System.Globalization.CultureInfo.InvariantCulture), "--actor", "dana");
        CliRun endAgain = await Cli("quiet", "end", id.ToString(System.Globalization.CultureInfo.InvariantCulture));
        CliRun endUnknown = await Cli("quiet", "end", "987654321");
        Assert.Equal(0, end.ExitCode);
        Assert.StartsWith($"quiet period {id} ended by person:dana", end.Output, StringComparison.Ordinal);
        Assert.Equal(0, endAgain.ExitCode);
        Assert.Contains("already ended by person:dana", endAgain.Output, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.RuntimeError, endUnknown.ExitCode);
        using JsonDocument active = JsonDocument.Parse((await Cli("quiet", "list", "--format", "json")).Output);
        Assert.DoesNotContain(active.RootElement.GetProperty("quiet_periods").EnumerateArray(), q => q.GetProperty("id").GetInt64() == id);
        using JsonDocument every = JsonDocument.Parse((await Cli("quiet", "list", "--all", "--format", "json")).Output);
        Assert.Contains(every.RootElement.GetProperty("quiet_periods").EnumerateArray(), q => q.GetProperty("id").GetInt64() == id && q.GetProperty("state").GetString() == "ended");
    }

    [Fact]
    public async Task Status_shows_one_row_per_model_with_its_last_run_open_alerts_and_baseline_and_fails_on_request()
    {
        CliRun json = await Cli("status", "--format", "json");
        CliRun table = await Cli("status");
        CliRun failOnCritical = await Cli("status", "--fail-on", "critical");
        CliRun badLevel = await Cli("status", "--fail-on", "ok");

        Assert.Equal(0, json.ExitCode);
        using JsonDocument status = JsonDocument.Parse(json.Output);
        JsonElement florist = status.RootElement.GetProperty("models").EnumerateArray().Single(m => m.GetProperty("key").GetString() == "florist-minutes");
        Assert.Equal(
            ["key", "enabled", "last_run_at", "last_status", "worst_severity", "open_alerts", "quiet_until", "baseline_version", "baseline_age_days", "failing_runs"],
            florist.EnumerateObject().Select(p => p.Name));
        Assert.True(florist.GetProperty("enabled").GetBoolean());
        Assert.Equal("ok", florist.GetProperty("last_status").GetString());
        Assert.Equal(1, florist.GetProperty("open_alerts").GetProperty("critical").GetInt32());
        Assert.Equal(0, florist.GetProperty("open_alerts").GetProperty("warning").GetInt32());
        Assert.Equal(JsonValueKind.Null, florist.GetProperty("baseline_version").ValueKind);
        Assert.Equal(0, florist.GetProperty("failing_runs").GetInt32());
        Assert.Equal(0, table.ExitCode);
        Assert.Contains("1 critical", table.Output, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Findings, failOnCritical.ExitCode);
        Assert.Equal(ExitCodes.Usage, badLevel.ExitCode);
    }

    [Fact]
    public async Task A_condition_that_returns_after_resolution_opens_a_new_alert_with_its_own_number_naming_the_one_before()
    {
        await using NpgsqlConnection connection = await database.DataSource.OpenConnectionAsync();
        await connection.ExecuteAsync("UPDATE modelwatch.alert SET state = 'resolved', resolved_at = opened_at, resolved_by = 'person:dana' WHERE id = @id", new { id = _alertId });
        long again = await connection.QuerySingleAsync<long>("""
            INSERT INTO modelwatch.alert (model_key, check_name, subject, severity, state, opened_at, opened_by, first_run_id, last_run_id, previous_alert_id)
            VALUES ('florist-minutes', 'coefficients', NULL, 'warning', 'open', '2026-05-03T06:00:02Z', 'daemon:replica-a', @run, @run, @previous)
            RETURNING id
            """, new { run = _runId, previous = _alertId });

        CliRun show = await Cli("alerts", "show", again.ToString(System.Globalization.CultureInfo.InvariantCulture));
        CliRun json = await Cli("alerts", "show", again.ToString(System.Globalization.CultureInfo.InvariantCulture), "--format", "json");

        // Alerts draw numbers from their own sequence: the new one follows the last alert, not the last run.
        Assert.Equal(_alertId + 1, again);
        Assert.Contains($"(again, after #{_alertId})", show.Output, StringComparison.Ordinal);
        using JsonDocument shown = JsonDocument.Parse(json.Output);
        Assert.Equal(_alertId, shown.RootElement.GetProperty("previous_alert").GetInt64());
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
        Assert.Contains("no alert #987654321", run.Error, StringComparison.Ordinal);
    }

    private string Id() => _alertId.ToString(System.Globalization.CultureInfo.InvariantCulture);

    private Task<CliRun> Cli(params string[] args) => CliRun.InvokeAsync([.. args, "--database", database.ConnectionString]);
}
