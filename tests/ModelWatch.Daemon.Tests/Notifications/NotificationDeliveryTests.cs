using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Notifications;

public sealed class NotificationDeliveryTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    private const string Secret = "loopback-receiver-shared-secret";

    [Fact]
    public async Task An_opened_alert_reaches_the_webhook_signed_and_a_quiet_model_sends_nothing_but_records_each_held_notification()
    {
        await DaemonTestData.PrepareAsync(database, hours: 24 + 30, breakAtHour: 24 + 6);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "parcels-paged", notify: "[pager, channel]");
        await DaemonTestData.RegisterAsync(database, time, "parcels-quiet", notify: "[pager]");
        var quiet = new ModelWatch.Daemon.Alerts.QuietPeriodRepository(database.DataSource, DaemonTestData.CommandTimeout);
        long period = await quiet.CreateAsync("parcels-quiet", null, DaemonTestData.ReferenceEnd.AddDays(30), "planned re-baseline", "person:test", time.GetUtcNow(), CancellationToken.None);
        using var pager = new LoopbackReceiver(500);
        using var channel = new LoopbackReceiver();
        await using var daemon = new DaemonInstance(database, time, "notifier", settings: new Dictionary<string, string?>
        {
            ["Notifications:Targets:pager:Url"] = pager.Url,
            ["Notifications:Targets:pager:Secret"] = Secret,
            ["Notifications:Targets:pager:MinimumSeverity"] = "critical",
            ["Notifications:Targets:pager:InitialBackoff"] = "00:00:00.010",
            ["Notifications:Targets:channel:Url"] = channel.Url,
            ["Notifications:Targets:channel:Secret"] = Secret,
        });
        await daemon.StartAsync();
        await daemon.StartNotificationsAsync();
        for (int hour = 1; hour <= 20; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key LIKE 'parcels-%'", 2 * hour);
        }

        // The pager answered 500 once, then 200: two attempts for the first alert, both recorded.
        await DaemonTestData.StepToAsync(time, time.GetUtcNow(), database.DataSource,
            "SELECT count(*) FROM modelwatch.notification_attempt WHERE target = 'pager' AND error IS NULL", 1);
        await daemon.StopAsync();

        Assert.True(pager.Received.TryDequeue(out var first));
        Assert.True(LoopbackReceiver.Verifies(first, Secret));
        Assert.Contains("\"model\":\"parcels-paged\"", System.Text.Encoding.UTF8.GetString(first.Body), StringComparison.Ordinal);
        Assert.NotEmpty(channel.Received);
        Assert.Equal(2, await DaemonTestData.ScalarAsync(database.DataSource,
            "SELECT count(*) FROM modelwatch.notification_attempt WHERE target = 'pager' AND alert_id = (SELECT min(alert_id) FROM modelwatch.notification_attempt WHERE target = 'pager')"));
        Assert.True(await DaemonTestData.ScalarAsync(database.DataSource, "SELECT count(*) FROM modelwatch.alert WHERE model_key = 'parcels-quiet'") > 0);
        Assert.DoesNotContain(pager.Received.Concat(channel.Received), r => System.Text.Encoding.UTF8.GetString(r.Body).Contains("parcels-quiet", StringComparison.Ordinal));

        // Runs and alerts went on; every notification of the quiet model was recorded as held, naming the period.
        long held = await DaemonTestData.ScalarAsync(database.DataSource,
            $"SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert a ON a.id = n.alert_id WHERE a.model_key = 'parcels-quiet' AND n.state = 'held' AND n.detail = 'held by quiet period {period}'");
        Assert.True(held > 0);
        Assert.Equal(0, await DaemonTestData.ScalarAsync(database.DataSource,
            "SELECT count(*) FROM modelwatch.notification n JOIN modelwatch.alert a ON a.id = n.alert_id WHERE a.model_key = 'parcels-quiet' AND n.state NOT IN ('held', 'pending')"));
        ModelWatch.Daemon.Alerts.QuietPeriod listed = Assert.Single(await quiet.ListAsync(false, "parcels-quiet", time.GetUtcNow(), CancellationToken.None));
        Assert.Equal(held, listed.Held);
    }
}
