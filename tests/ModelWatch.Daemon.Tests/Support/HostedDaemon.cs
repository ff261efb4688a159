using System.Net;
using System.Net.Sockets;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Hosting;

namespace ModelWatch.Daemon.Tests.Support;

/// <summary>
/// The whole daemon host as <c>modelwatch daemon</c> builds it (Kestrel included when enabled), on real time, logging
/// into memory (or through Serilog, as in production, when asked).
/// </summary>
internal sealed class HostedDaemon : IAsyncDisposable
{
    private HostedDaemon(IHost host, CapturedLogs logs)
    {
        Host = host;
        Logs = logs;
    }

    public IHost Host { get; }

    public CapturedLogs Logs { get; }

    public static async Task<HostedDaemon> StartAsync(string connectionString, Dictionary<string, string?> settings, Action<IServiceCollection>? configure = null, bool serilog = false)
    {
        var logs = new CapturedLogs();
        var values = new Dictionary<string, string?>
        {
            ["Daemon:WorkerId"] = "hosted-" + Guid.NewGuid().ToString("N")[..8],
            ["Daemon:PollInterval"] = "00:00:01",
            ["Specs:Directory"] = string.Empty,
        };
        foreach ((string key, string? value) in settings)
        {
            values[key] = value;
        }

        IHost host = DaemonHost.Build(
            [],
            connectionString,
            configuration => configuration.AddInMemoryCollection(values),
            services =>
            {
                if (!serilog)
                {
                    services.RemoveAll<ILoggerFactory>();
                    services.AddSingleton<ILoggerFactory>(_ => LoggerFactory.Create(b => b.SetMinimumLevel(LogLevel.Debug).AddProvider(logs)));
                }

                configure?.Invoke(services);
            });
        await host.StartAsync();
        return new HostedDaemon(host, logs);
    }

    public static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    public async ValueTask DisposeAsync()
    {
        using var limit = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        await Host.StopAsync(limit.Token);
        if (Host is IAsyncDisposable disposable)
        {
            await disposable.DisposeAsync();
        }
        else
        {
            Host.Dispose();
        }
    }
}
