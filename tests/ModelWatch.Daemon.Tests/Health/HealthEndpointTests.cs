using System.Net;
using System.Net.Sockets;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Health;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Tests.Health;

public sealed class HealthEndpointTests
{
    [Fact]
    public async Task Liveness_follows_the_loop_and_readiness_follows_the_database()
    {
        var time = new FakeTimeProvider(new DateTimeOffset(2026, 12, 1, 0, 0, 0, TimeSpan.Zero));
        var health = new DaemonHealth(time);
        int port = FreePort();
        var endpoint = new HealthEndpoint(
            health,
            Microsoft.Extensions.Options.Options.Create(new HealthOptions { Enabled = true, Port = port }),
            Microsoft.Extensions.Options.Options.Create(new DaemonOptions { PollInterval = TimeSpan.FromSeconds(15) }),
            NullLogger<HealthEndpoint>.Instance);
        await endpoint.StartAsync(CancellationToken.None);
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };
        try
        {
            health.CycleCompleted();
            Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("healthz/live")).StatusCode);
            Assert.Equal(HttpStatusCode.ServiceUnavailable, (await http.GetAsync("healthz/ready")).StatusCode);

            health.DatabaseAvailable();
            Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("healthz/ready")).StatusCode);

            // Four poll intervals without a cycle: the loop is stalled.
            time.Advance(TimeSpan.FromMinutes(2));
            Assert.Equal(HttpStatusCode.ServiceUnavailable, (await http.GetAsync("healthz/live")).StatusCode);

            health.DatabaseUnavailable("connection refused");
            HttpResponseMessage ready = await http.GetAsync("healthz/ready");
            Assert.Equal(HttpStatusCode.ServiceUnavailable, ready.StatusCode);
            Assert.Contains("connection refused", await ready.Content.ReadAsStringAsync(), StringComparison.Ordinal);

            // Nothing it serves changes state.
            Assert.Equal(HttpStatusCode.MethodNotAllowed, (await http.PostAsync("healthz/ready", null)).StatusCode);
            Assert.Equal(HttpStatusCode.NotFound, (await http.GetAsync("metrics")).StatusCode);
        }
        finally
        {
            await endpoint.StopAsync(CancellationToken.None);
        }
    }

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
