using System.Collections.Concurrent;
using System.Net;
using System.Net.Sockets;

namespace ModelWatch.Daemon.Tests.Notifications;

/// <summary>A webhook receiver on a free loopback port that answers with a scripted sequence of status codes.</summary>
internal sealed class LoopbackReceiver : IDisposable
{
    private readonly HttpListener _listener = new();
    private readonly Queue<int> _statuses;
    private readonly Task _loop;

    public LoopbackReceiver(params int[] statuses)
    {
        _statuses = new Queue<int>(statuses);
        using var probe = new TcpListener(IPAddress.Loopback, 0);
        probe.Start();
        int port = ((IPEndPoint)probe.LocalEndpoint).Port;
        probe.Stop();
        Url = $"http://127.0.0.1:{port}/hook/";
        _listener.Prefixes.Add(Url);
        _listener.Start();
        _loop = Task.Run(ServeAsync);
    }

    public string Url { get; }

    /// <summary>Whether a received request's signature holds for <paramref name="secret"/> at the moment it was sent.</summary>
    public static bool Verifies((byte[] Body, string? Signature, string? Attempt, string? Timestamp) received, string secret) =>
        received.Timestamp is { } t && ModelWatch.Daemon.Notifications.WebhookSignature.Verify(
            received.Body, secret, t, received.Signature, DateTimeOffset.FromUnixTimeSeconds(long.Parse(t, System.Globalization.CultureInfo.InvariantCulture)), TimeSpan.Zero);

    public ConcurrentQueue<(byte[] Body, string? Signature, string? Attempt, string? Timestamp)> Received { get; } = new();

    public void Dispose()
    {
        _listener.Stop();
        _listener.Close();
        try
        {
            _loop.Wait(TimeSpan.FromSeconds(5));
        }
        catch (AggregateException)
        {
        }
    }

    private async Task ServeAsync()
    {
        while (_listener.IsListening)
        {
            HttpListenerContext context;
            try
            {
                context = await _listener.GetContextAsync();
            }
            catch (Exception ex) when (ex is HttpListenerException or ObjectDisposedException or InvalidOperationException)
            {
                return;
            }

            using var body = new MemoryStream();
            await context.Request.InputStream.CopyToAsync(body);
            Received.Enqueue((body.ToArray(), context.Request.Headers["X-ModelWatch-Signature"], context.Request.Headers["X-ModelWatch-Attempt"], context.Request.Headers["X-ModelWatch-Timestamp"]));
            context.Response.StatusCode = _statuses.Count > 0 ? _statuses.Dequeue() : 200;
            context.Response.Close();
        }
    }
}
