using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Telemetry;

/// <summary>The whole host exporting to a local OTLP/HTTP receiver, as a collector would see it.</summary>
public sealed class OtlpExportTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task Every_signal_arrives_as_one_service_and_each_alert_transition_is_exported_once()
    {
        await DaemonTestData.PrepareAsync(database, hours: 48);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "exported-broken");
        await DaemonTestData.ApplyQueryAsync(database, time, "exported-broken", "SELECT shipped_at, distance_km, stops, weight_kg, minutes FROM shipments_gone WHERE shipped_at >= @window_start AND shipped_at < @window_end");

        // Four missed slots are caught up at once on the real clock: the third failure opens the source alert.
        await DaemonTestData.ScalarAsync(database.DataSource, "WITH d AS (UPDATE modelwatch.model SET next_due_slot = '2026-01-02T00:00:00Z' WHERE key = 'exported-broken' RETURNING 1) SELECT count(*) FROM d");
        using var receiver = new OtlpReceiver();
        await using (HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Daemon:MissedSlots"] = "CatchUp",
            ["Daemon:MaxCatchUpSlots"] = "4",
            ["OTEL_EXPORTER_OTLP_ENDPOINT"] = receiver.Endpoint,
            ["OTEL_EXPORTER_OTLP_PROTOCOL"] = "http/protobuf",
            ["OTEL_SERVICE_NAME"] = "courier-watch-under-test",
            ["OTEL_RESOURCE_ATTRIBUTES"] = "deployment.environment=ci",
            ["Logging:LogLevel:Default"] = "Information",
        }, serilog: true))
        {
            long started = TimeProvider.System.GetTimestamp();
            while (await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'exported-broken'") < 4)
            {
                Assert.True(TimeProvider.System.GetElapsedTime(started) < TimeSpan.FromSeconds(60), "the catch-up runs did not finish");
                await Task.Delay(100);
            }
        }

        // Disposing the host flushed every exporter.
        Assert.Equal(1, await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert_event e JOIN modelwatch.alert a ON a.id = e.alert_id WHERE a.model_key = 'exported-broken' AND e.transition = 'opened'"));
        foreach (string path in (string[])["/v1/traces", "/v1/metrics", "/v1/logs"])
        {
            Assert.NotEmpty(receiver.Bodies(path));
            Assert.All(receiver.Bodies(path), body => Assert.Contains("courier-watch-under-test", body, StringComparison.Ordinal));
            Assert.Equal(0, receiver.Count(path, "unknown_service"));
        }

        // Serilog's ordinary logs arrive too, under the same service, and the alert event arrives once (not also through Serilog).
        Assert.True(receiver.Count("/v1/logs", "message_template") > 0, "no ordinary log arrived through Serilog: " + string.Join(" / ", receiver.Received.Select(r => r.Path + " " + r.Body.Length)));
        Assert.Equal(1, receiver.Count("/v1/logs", "modelwatch.alert.opened"));
        Assert.True(receiver.Count("/v1/logs", "deployment.environment") >= 2);
    }
}
