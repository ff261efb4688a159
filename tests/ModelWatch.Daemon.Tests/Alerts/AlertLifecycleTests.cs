using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;
using OpenTelemetry.Logs;

namespace ModelWatch.Daemon.Tests.Alerts;

public sealed class AlertLifecycleTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task A_changed_relationship_opens_one_alert_that_an_engineer_acknowledges_and_resolves()
    {
        // The minutes per km double six hours into monitoring (invented change).
        await DaemonTestData.PrepareAsync(database, hours: 24 + 30, breakAtHour: 24 + 6);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, "parcels-west");
        var records = new List<LogRecord>();
        await using var daemon = new DaemonInstance(database, time, "alerting", configure: services =>
            services.AddSingleton(sp => new AlertEventPipeline(o => o.AddInMemoryExporter(records), sp.GetRequiredService<ILoggerFactory>())));
        await daemon.StartAsync();
        for (int hour = 1; hour <= 20; hour++)
        {
            await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource, "SELECT count(*) FROM modelwatch.run WHERE model_key = 'parcels-west'", hour);
        }

        await daemon.StopAsync();
        var alerts = new AlertRepository(database.DataSource, DaemonTestData.CommandTimeout);
        IReadOnlyList<AlertView> open = await alerts.ListAsync("parcels-west", "unresolved", 100, CancellationToken.None);
        long beforeBreak = await DaemonTestData.ScalarAsync(database.DataSource,
            $"SELECT count(*) FROM modelwatch.alert WHERE model_key = 'parcels-west' AND opened_at < '{DaemonTestData.ReferenceEnd.AddHours(7):O}'::timestamptz");

        Assert.Equal(0, beforeBreak);
        AlertView coefficients = Assert.Single(open, a => a.Check == "coefficients" && a.Subject is null);
        Assert.Equal("critical", coefficients.Severity);
        Assert.Equal("open", coefficients.State);
        Assert.NotNull(coefficients.Explanation);
        Assert.Equal(open.Count, open.Select(a => (a.Check, a.Subject)).Distinct().Count());
        Assert.Contains(records, r => r.EventId.Name == "modelwatch.alert.opened");

        DateTimeOffset now = time.GetUtcNow();
        Assert.Equal(AlertChangeKind.Changed, (await alerts.AcknowledgeAsync(coefficients.Id, "oncall@example.test", "looking at the route data", now, CancellationToken.None)).Kind);
        Assert.Equal(AlertChangeKind.AlreadyDone, (await alerts.AcknowledgeAsync(coefficients.Id, "oncall@example.test", null, now, CancellationToken.None)).Kind);
        Assert.Equal(AlertChangeKind.Changed, (await alerts.ResolveAsync(coefficients.Id, "oncall@example.test", "re-baselined after the tariff change", now, CancellationToken.None)).Kind);
        Assert.Equal(AlertChangeKind.AlreadyDone, (await alerts.ResolveAsync(coefficients.Id, "someone-else", null, now, CancellationToken.None)).Kind);
        Assert.Equal(AlertChangeKind.NotFound, (await alerts.ResolveAsync(987_654_321, "someone-else", null, now, CancellationToken.None)).Kind);

        AlertView resolved = (await alerts.GetAsync(coefficients.Id, CancellationToken.None))!;
        IReadOnlyList<AlertHistoryEntry> history = await alerts.HistoryAsync(coefficients.Id, CancellationToken.None);
        Assert.Equal("resolved", resolved.State);
        Assert.Equal("oncall@example.test", resolved.AcknowledgedBy);
        Assert.Equal("re-baselined after the tariff change", resolved.Note);
        Assert.Equal(["opened", "acknowledged", "resolved"], history.Select(h => h.Transition));
    }
}
