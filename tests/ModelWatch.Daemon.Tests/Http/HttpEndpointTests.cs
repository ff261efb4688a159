using System.Net;
using System.Net.Sockets;
using System.Text;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using ModelWatch.Daemon.Health;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Http;

public sealed class HttpEndpointTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [Fact]
    public async Task Health_and_the_scrape_answer_on_loopback_under_any_host_name()
    {
        (HostedDaemon daemon, int port) = await StartWithScrapeAsync();
        await using HostedDaemon running = daemon;
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };

        HttpResponseMessage live = await UntilAsync(http, "healthz/live", HttpStatusCode.OK);
        HttpResponseMessage ready = await UntilAsync(http, "healthz/ready", HttpStatusCode.OK);
        string readiness = await ready.Content.ReadAsStringAsync();
        Assert.Contains("\"state_database\":{\"status\":\"healthy\"", readiness, StringComparison.Ordinal);
        Assert.Contains("\"sources\":{\"status\":\"healthy\"", readiness, StringComparison.Ordinal);
        Assert.Contains("\"loop\":{\"status\":\"healthy\"", await live.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        // A scrape addressed to another host name (a container's service name) is answered all the same.
        using var scrape = new HttpRequestMessage(HttpMethod.Get, "metrics");
        scrape.Headers.Host = "modelwatch.monitoring.svc";
        HttpResponseMessage metrics = await http.SendAsync(scrape);
        Assert.Equal(HttpStatusCode.OK, metrics.StatusCode);
        Assert.StartsWith("text/plain", metrics.Content.Headers.ContentType?.MediaType ?? string.Empty, StringComparison.Ordinal);

        Assert.Equal(HttpStatusCode.NotFound, (await http.GetAsync("nothing-here")).StatusCode);
        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await http.PostAsync("healthz/live", null)).StatusCode);
        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await http.DeleteAsync("metrics")).StatusCode);
    }

    [Fact]
    public async Task No_request_of_any_method_size_or_encoding_stops_the_daemon()
    {
        (HostedDaemon daemon, int port) = await StartWithScrapeAsync();
        await using HostedDaemon running = daemon;
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };
        await UntilAsync(http, "healthz/live", HttpStatusCode.OK);
        var stopping = daemon.Host.Services.GetRequiredService<IHostApplicationLifetime>().ApplicationStopping;

        string[] requests =
        [
            "POST /healthz/live HTTP/1.1\r\nHost: x\r\n\r\n",
            "POST /healthz/live HTTP/1.1\r\nHost: x\r\nContent-Length: 100\r\n\r\nshort",
            "PUT /metrics HTTP/1.1\r\nHost: x\r\nTransfer-Encoding: chunked\r\n\r\nzz\r\nnot a chunk\r\n",
            "GET /healthz/ready HTTP/1.1\r\nHost: x\r\nContent-Length: -5\r\n\r\n",
            "GET /healthz/ready HTTP/1.1\r\nHost: x\r\nContent-Length: 99999999999\r\n\r\n",
            "BREW /healthz/live HTCPCP/1.0\r\n\r\n",
            "GET /" + new string('a', 70_000) + " HTTP/1.1\r\nHost: x\r\n\r\n",
            "GET /healthz/live HTTP/1.1\r\nHost: x\r\nX-Big: " + new string('b', 64_000) + "\r\n\r\n",
            "GET /%ZZ%00%ff/..%2f..%2fetc/passwd HTTP/1.1\r\nHost: x\r\n\r\n",
            "GET /healthz/live HTTP/1.1\r\nHost: x\r\nAccept-Encoding: gzip, br, \u0001\u0002\r\n\r\n",
            "PRI * HTTP/2.0\r\n\r\nSM\r\n\r\n\0\0\0\u0004\0\0\0\0\0",
            "GET /metrics HTTP/1.0\r\n\r\n",
            "\u0016\u0003\u0001\u0002\0\u0001\0\u0001\u00fc\u0003\u0003 a TLS hello on a plain port",
            "HEAD /healthz/live HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n",
        ];
        foreach (string request in requests)
        {
            await SendRawAsync(port, Encoding.Latin1.GetBytes(request), closeEarly: false);
            await SendRawAsync(port, Encoding.Latin1.GetBytes(request), closeEarly: true);
        }

        // A body far over the limit, streamed until the server gives up on it.
        await SendRawAsync(port, [.. Encoding.ASCII.GetBytes("POST /healthz/live HTTP/1.1\r\nHost: x\r\nContent-Length: 10000000\r\n\r\n"), .. new byte[2_000_000]], closeEarly: false);
        await SendRawAsync(port, [.. new byte[4096].Select((_, i) => (byte)(i * 31))], closeEarly: false);

        Assert.False(stopping.IsCancellationRequested, "a request stopped the host");
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("healthz/live")).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("metrics")).StatusCode);
    }

    [Fact]
    public async Task Every_interface_addresses_bind_for_ipv4_and_ipv6()
    {
        int any4 = HostedDaemon.FreePort();
        int any6 = HostedDaemon.FreePort();
        await using HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://0.0.0.0:{any4};http://[::]:{any6}",
        });

        using var http = new HttpClient();
        Assert.Equal(HttpStatusCode.OK, (await UntilAsync(http, $"http://127.0.0.1:{any4}/healthz/live", HttpStatusCode.OK)).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await UntilAsync(http, $"http://[::1]:{any6}/healthz/live", HttpStatusCode.OK)).StatusCode);
        Assert.Equal(HttpStatusCode.NotFound, (await http.GetAsync($"http://127.0.0.1:{any4}/metrics")).StatusCode);
    }

    [Fact]
    public async Task Readiness_fails_while_the_state_database_is_unreachable_and_a_silent_source_only_degrades_it()
    {
        int port = HostedDaemon.FreePort();
        int nobody = HostedDaemon.FreePort();
        await using HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://127.0.0.1:{port}",
            ["Sources:warehouse:ConnectionString"] = $"Host=127.0.0.1;Port={nobody};Username=x;Timeout=2",
        });
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };

        HttpResponseMessage ready = await UntilAsync(http, "healthz/ready", HttpStatusCode.OK);
        string body = await ready.Content.ReadAsStringAsync();
        Assert.Contains("\"status\":\"degraded\"", body, StringComparison.Ordinal);
        Assert.Contains("source(s) not answering: warehouse", body, StringComparison.Ordinal);

        daemon.Host.Services.GetRequiredService<DaemonHealth>().DatabaseUnavailable("connection refused (simulated)");
        HttpResponseMessage notReady = await http.GetAsync("healthz/ready");
        Assert.Equal(HttpStatusCode.ServiceUnavailable, notReady.StatusCode);
        Assert.Contains("connection refused (simulated)", await notReady.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }

    private async Task<(HostedDaemon Daemon, int Port)> StartWithScrapeAsync()
    {
        int port = HostedDaemon.FreePort();
        HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://127.0.0.1:{port}",
            ["Telemetry:PrometheusEnabled"] = "true",
        });
        return (daemon, port);
    }

    private static async Task<HttpResponseMessage> UntilAsync(HttpClient http, string path, HttpStatusCode wanted)
    {
        long started = TimeProvider.System.GetTimestamp();
        while (true)
        {
            HttpResponseMessage response = await http.GetAsync(path);
            if (response.StatusCode == wanted || TimeProvider.System.GetElapsedTime(started) > TimeSpan.FromSeconds(30))
            {
                return response;
            }

            await Task.Delay(100);
        }
    }

    private static async Task SendRawAsync(int port, byte[] bytes, bool closeEarly)
    {
        using var client = new TcpClient();
        await client.ConnectAsync(IPAddress.Loopback, port);
        NetworkStream stream = client.GetStream();
        try
        {
            await stream.WriteAsync(closeEarly ? bytes.AsMemory(0, Math.Max(1, bytes.Length / 2)) : bytes);
            if (closeEarly)
            {
                return;
            }

            // Read whatever answer comes, until the server closes or goes quiet.
            var buffer = new byte[8192];
            using var quiet = new CancellationTokenSource(TimeSpan.FromSeconds(2));
            while (await stream.ReadAsync(buffer, quiet.Token) > 0)
            {
            }
        }
        catch (Exception ex) when (ex is IOException or SocketException or OperationCanceledException)
        {
            // The server refusing or resetting the connection is one of the expected answers.
        }
    }
}
