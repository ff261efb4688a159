using System.Text.Json;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Tests.Notifications;

public sealed class WebhookSenderTests
{
    private const string Secret = "a-shared-secret-of-some-length";

    private static readonly AlertEvent Opened = new(
        42, "opened", "courier-eta", "coefficients", "route_km", "critical", "open", "z", 6.3, 6.0e-6,
        "coefficient of route_km moved from 1.92 to 2.41: z = 6.3 standard errors (Holm's critical |z| at its step 4.81), p = 3.0e-10 after Holm, α 6.0e-6",
        new DateTimeOffset(2026, 11, 30, 6, 0, 0, TimeSpan.Zero))
    {
        PValue = 3.0e-10,
        Alpha = 6.0e-6,
        Limit = 4.81,
    };

    [Fact]
    public async Task Delivers_a_signed_payload_that_the_receiver_can_verify()
    {
        using var receiver = new LoopbackReceiver(200);
        using var http = new HttpClient();
        var sender = new WebhookSender(http, TimeProvider.System);
        byte[] body = NotificationPayload.Create(Opened, Opened.At);

        IReadOnlyList<DeliveryAttempt> attempts = await sender.DeliverAsync("pager", Target(receiver.Url), Opened.AlertId, body, CancellationToken.None);

        DeliveryAttempt attempt = Assert.Single(attempts);
        Assert.True(attempt.Succeeded);
        Assert.Equal(200, attempt.StatusCode);
        Assert.True(receiver.Received.TryDequeue(out var received));
        Assert.True(LoopbackReceiver.Verifies(received, Secret));
        Assert.False(LoopbackReceiver.Verifies(received, "another-secret-entirely"));
        using var json = JsonDocument.Parse(received.Body);
        Assert.Equal("modelwatch.alert.opened", json.RootElement.GetProperty("event").GetString());
        Assert.Equal("route_km", json.RootElement.GetProperty("alert").GetProperty("subject").GetString());
        JsonElement alert = json.RootElement.GetProperty("alert");
        Assert.Equal(6.3, alert.GetProperty("value").GetDouble());
        Assert.Equal(6.0e-6, alert.GetProperty("threshold").GetDouble());
        Assert.Equal(3.0e-10, alert.GetProperty("p_value").GetDouble());
        Assert.Equal(6.0e-6, alert.GetProperty("alpha").GetDouble());
        Assert.Equal(4.81, alert.GetProperty("limit").GetDouble());
    }

    [Fact]
    public async Task Retries_after_a_server_error_with_back_off_on_the_injected_clock()
    {
        using var receiver = new LoopbackReceiver(500, 503, 200);
        using var http = new HttpClient();
        var time = new FakeTimeProvider(new DateTimeOffset(2026, 12, 1, 0, 0, 0, TimeSpan.Zero));
        var sender = new WebhookSender(http, time);
        byte[] body = NotificationPayload.Create(Opened, Opened.At);

        Task<IReadOnlyList<DeliveryAttempt>> delivery = sender.DeliverAsync("pager", Target(receiver.Url), Opened.AlertId, body, CancellationToken.None);
        long started = TimeProvider.System.GetTimestamp();
        while (!delivery.IsCompleted && TimeProvider.System.GetElapsedTime(started) < TimeSpan.FromSeconds(60))
        {
            // The sender waits on the fake clock between attempts; move it on while the loopback requests proceed.
            time.Advance(TimeSpan.FromSeconds(1));
            await Task.Delay(5);
        }

        Assert.True(delivery.IsCompleted, "delivery did not finish within a minute of real time");

        IReadOnlyList<DeliveryAttempt> attempts = await delivery;
        Assert.Equal([500, 503, 200], attempts.Select(a => a.StatusCode!.Value));
        Assert.Equal([false, false, true], attempts.Select(a => a.Succeeded));
        Assert.True(attempts[1].At > attempts[0].At, "the second attempt waited for the back-off");
        Assert.Equal(["1", "2", "3"], receiver.Received.Select(r => r.Attempt!));
    }

    [Fact]
    public async Task A_client_error_is_final()
    {
        using var receiver = new LoopbackReceiver(404);
        using var http = new HttpClient();
        var sender = new WebhookSender(http, TimeProvider.System);

        IReadOnlyList<DeliveryAttempt> attempts = await sender.DeliverAsync("pager", Target(receiver.Url), 1, [1, 2, 3], CancellationToken.None);

        DeliveryAttempt attempt = Assert.Single(attempts);
        Assert.Contains("404", attempt.Error, StringComparison.Ordinal);
    }

    [Fact]
    public void The_mac_is_hmac_sha256_and_the_signature_covers_the_timestamp_and_the_body()
    {
        // RFC 4231 test case 2: key "Jefe", data "what do ya want for nothing?".
        Assert.Equal("sha256=5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843", WebhookSignature.Mac("what do ya want for nothing?"u8, "Jefe"));

        // The signed message is TIMESTAMP "." BODY.
        Assert.Equal(WebhookSignature.Mac("1764662400.{\"a\":1}"u8, Secret), WebhookSignature.Sign(1764662400, "{\"a\":1}"u8, Secret));
        var sentAt = DateTimeOffset.FromUnixTimeSeconds(1764662400);
        string signature = WebhookSignature.Sign(1764662400, "{\"a\":1}"u8, Secret);
        Assert.True(WebhookSignature.Verify("{\"a\":1}"u8, Secret, "1764662400", signature, sentAt.AddMinutes(4), WebhookSignature.RecommendedTolerance));

        // A captured request replayed later, with another timestamp, or with a changed body is refused.
        Assert.False(WebhookSignature.Verify("{\"a\":1}"u8, Secret, "1764662400", signature, sentAt.AddMinutes(6), WebhookSignature.RecommendedTolerance));
        Assert.False(WebhookSignature.Verify("{\"a\":1}"u8, Secret, "1764662700", signature, sentAt.AddMinutes(5), WebhookSignature.RecommendedTolerance));
        Assert.False(WebhookSignature.Verify("{\"a\":2}"u8, Secret, "1764662400", signature, sentAt, WebhookSignature.RecommendedTolerance));
        Assert.False(WebhookSignature.Verify("{\"a\":1}"u8, Secret, null, signature, sentAt, WebhookSignature.RecommendedTolerance));
    }

    [Fact]
    public async Task Each_attempt_is_signed_with_its_own_timestamp_and_carries_its_number_in_the_signed_body()
    {
        using var receiver = new LoopbackReceiver(503, 200);
        using var http = new HttpClient();
        var time = new FakeTimeProvider(new DateTimeOffset(2026, 12, 2, 6, 0, 0, TimeSpan.Zero));
        var sender = new WebhookSender(http, time);

        Task<IReadOnlyList<DeliveryAttempt>> delivery = sender.DeliverAsync("pager", Target(receiver.Url), Opened.AlertId, (attempt, at) => NotificationPayload.Create(Opened, at, attempt), CancellationToken.None);
        while (!delivery.IsCompleted)
        {
            time.Advance(TimeSpan.FromSeconds(1));
            await Task.Delay(5);
        }

        var received = receiver.Received.ToList();
        Assert.Equal(2, received.Count);
        Assert.All(received, r => Assert.True(LoopbackReceiver.Verifies(r, Secret)));
        Assert.NotEqual(received[0].Timestamp, received[1].Timestamp);
        Assert.Equal([1, 2], received.Select(r => JsonDocument.Parse(r.Body).RootElement.GetProperty("attempt").GetInt32()));
        Assert.Equal(["1", "2"], received.Select(r => r.Attempt!));
    }

    private static NotificationTargetOptions Target(string url) => new()
    {
        Url = url,
        Secret = Secret,
        MaxAttempts = 4,
        InitialBackoff = TimeSpan.FromSeconds(2),
        Timeout = TimeSpan.FromSeconds(10),
    };
}
