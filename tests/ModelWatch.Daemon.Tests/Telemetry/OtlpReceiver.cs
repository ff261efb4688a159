using System.Collections.Concurrent;
using System.Net;
using System.Text;

namespace ModelWatch.Daemon.Tests.Telemetry;

/// <summary>
/// A local OTLP/HTTP receiver: accepts protobuf POSTs on <c>/v1/traces</c>, <c>/v1/metrics</c> and <c>/v1/logs</c>,
/// answers 200 and keeps the bodies. Tests look for strings in them (protobuf stores strings as plain UTF-8).
/// </summary>
internal sealed class OtlpReceiver : IDisposable
{
    private readonly HttpListener _listener = new();
    private readonly Task _loop;

    public OtlpReceiver()
    {
        int port = Support.HostedDaemon.FreePort();
        Endpoint = $"http://127.0.0.1:{port}";
        _listener.Prefixes.Add(Endpoint + "/");
        _listener.Start();
        _loop = Task.Run(ServeAsync);
    }

    public string Endpoint { get; }

    public ConcurrentQueue<(string Path, byte[] Body)> Received { get; } = new();

    /// <summary>The bodies received on one path, as Latin-1 text (byte for byte).</summary>
    public List<string> Bodies(string path) => [.. Received.Where(r => r.Path == path).Select(r => Encoding.Latin1.GetString(r.Body))];

    /// <summary>How often <paramref name="text"/> occurs in the bodies of <paramref name="path"/>.</summary>
    public int Count(string path, string text)
    {
        string needle = Encoding.Latin1.GetString(Encoding.UTF8.GetBytes(text));
        int count = 0;
        foreach (string body in Bodies(path))
        {
            for (int at = body.IndexOf(needle, StringComparison.Ordinal); at >= 0; at = body.IndexOf(needle, at + needle.Length, StringComparison.Ordinal))
            {
                count++;
            }
        }

        return count;
    }

    public void Dispose()
    {
        _listener.Close();
        try
        {
            _loop.Wait(TimeSpan.FromSeconds(5));
        }
        catch (AggregateException)
        {
            // The loop ends with the listener.
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
            Received.Enqueue((context.Request.Url!.AbsolutePath, body.ToArray()));
            context.Response.StatusCode = 200;
            context.Response.ContentType = "application/x-protobuf";
            context.Response.Close();
        }
    }
}
