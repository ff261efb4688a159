using System.Net.Http.Headers;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// POSTs a body, signed afresh for each attempt with the attempt's timestamp (<see cref="WebhookSignature"/>), to a webhook target, retrying with exponential back-off and jitter on network errors,
/// timeouts, 429 and 5xx answers; other 4xx answers are final. Waits go through the injected
/// <see cref="TimeProvider"/>, so tests drive them with a fake clock. Every attempt is returned for the record.
/// </summary>
public sealed class WebhookSender(HttpClient http, TimeProvider time)
{
    private readonly Random _jitter = new();

    /// <summary>Delivers one fixed body; returns every attempt made.</summary>
    public Task<IReadOnlyList<DeliveryAttempt>> DeliverAsync(string targetName, NotificationTargetOptions target, long alertId, byte[] body, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(body);
        return DeliverAsync(targetName, target, alertId, (_, _) => body, cancellationToken);
    }

    /// <summary>Delivers the body <paramref name="bodyFor"/> makes for each attempt (number, send time); returns every attempt made.</summary>
    public async Task<IReadOnlyList<DeliveryAttempt>> DeliverAsync(string targetName, NotificationTargetOptions target, long alertId, Func<int, DateTimeOffset, byte[]> bodyFor, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(target);
        ArgumentNullException.ThrowIfNull(bodyFor);
        var attempts = new List<DeliveryAttempt>();
        for (int attempt = 1; attempt <= target.MaxAttempts; attempt++)
        {
            DeliveryAttempt result = await SendOnceAsync(targetName, target, alertId, bodyFor, attempt, cancellationToken);
            attempts.Add(result);
            if (result.Succeeded || !IsRetryable(result.StatusCode) || attempt == target.MaxAttempts)
            {
                break;
            }

            await Task.Delay(Backoff(target.InitialBackoff, attempt), time, cancellationToken);
        }

        return attempts;
    }

    private static bool IsRetryable(int? status) => status is null or 408 or 429 or >= 500;

    private TimeSpan Backoff(TimeSpan initial, int attempt)
    {
        double factor = Math.Pow(2, attempt - 1);
        double jitter = 0.8 + (0.4 * _jitter.NextDouble());
        return TimeSpan.FromTicks((long)(initial.Ticks * factor * jitter));
    }

    private async Task<DeliveryAttempt> SendOnceAsync(string targetName, NotificationTargetOptions target, long alertId, Func<int, DateTimeOffset, byte[]> bodyFor, int attempt, CancellationToken cancellationToken)
    {
        DateTimeOffset at = time.GetUtcNow();
        byte[] body = bodyFor(attempt, at);
        long timestamp = at.ToUnixTimeSeconds();
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        timeout.CancelAfter(target.Timeout);
        using var request = new HttpRequestMessage(HttpMethod.Post, target.Url) { Content = new ByteArrayContent(body) };
        request.Content.Headers.ContentType = new MediaTypeHeaderValue("application/json");
        request.Headers.Add(WebhookSignature.TimestampHeaderName, timestamp.ToString(System.Globalization.CultureInfo.InvariantCulture));
        request.Headers.Add(WebhookSignature.HeaderName, WebhookSignature.Sign(timestamp, body, target.Secret));
        request.Headers.Add("X-ModelWatch-Attempt", attempt.ToString(System.Globalization.CultureInfo.InvariantCulture));
        try
        {
            using HttpResponseMessage response = await http.SendAsync(request, timeout.Token);
            int status = (int)response.StatusCode;
            return response.IsSuccessStatusCode
                ? new DeliveryAttempt(targetName, alertId, attempt, at, status, null)
                : new DeliveryAttempt(targetName, alertId, attempt, at, status, $"target answered {status} {response.ReasonPhrase}");
        }
        catch (OperationCanceledException) when (!cancellationToken.IsCancellationRequested)
        {
            return new DeliveryAttempt(targetName, alertId, attempt, at, null, $"no answer within {target.Timeout.TotalSeconds:0.#} s");
        }
        catch (HttpRequestException ex)
        {
            return new DeliveryAttempt(targetName, alertId, attempt, at, null, ex.Message);
        }
    }
}
