using System.Net;
using System.Text;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Options;

namespace ModelWatch.Daemon.Health;

/// <summary>
/// A small read-only HTTP endpoint: <c>GET /healthz/live</c> (the loop completed a cycle recently) and
/// <c>GET /healthz/ready</c> (the state database is reachable and migrated). Off unless <c>Health:Enabled</c>;
/// binds to loopback unless told otherwise; nothing it serves changes state.
/// </summary>
public sealed partial class HealthEndpoint(
    DaemonHealth health,
    IOptions<HealthOptions> options,
    IOptions<DaemonOptions> daemon,
    ILogger<HealthEndpoint> logger) : BackgroundService
{
    private HttpListener? _listener;

    /// <summary>Binds the port before the host finishes starting, so a port conflict stops the daemon at boot.</summary>
    public override Task StartAsync(CancellationToken cancellationToken)
    {
        HealthOptions settings = options.Value;
        if (settings.Enabled)
        {
            string host = settings.Address is "*" or "0.0.0.0" ? "+" : settings.Address;
            _listener = new HttpListener();
            _listener.Prefixes.Add($"http://{host}:{settings.Port}/");
            _listener.Start();
            LogListening(logger, settings.Address, settings.Port);
        }

        return base.StartAsync(cancellationToken);
    }

    /// <inheritdoc />
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        if (_listener is not { } listener)
        {
            return;
        }

        HealthOptions settings = options.Value;
        using CancellationTokenRegistration stop = stoppingToken.Register(listener.Stop);
        while (!stoppingToken.IsCancellationRequested)
        {
            HttpListenerContext context;
            try
            {
                context = await listener.GetContextAsync();
            }
            catch (Exception ex) when (ex is HttpListenerException or ObjectDisposedException or InvalidOperationException)
            {
                break;
            }

            Respond(context, settings);
        }
    }

    /// <inheritdoc />
    public override void Dispose()
    {
        _listener?.Close();
        base.Dispose();
    }

    private void Respond(HttpListenerContext context, HealthOptions settings)
    {
        using HttpListenerResponse response = context.Response;
        (int status, string body) = (context.Request.HttpMethod, context.Request.Url?.AbsolutePath) switch
        {
            ("GET", "/healthz/live") => Live(settings),
            ("GET", "/healthz/ready") => Ready(),
            ("GET", _) => (404, "{\"status\":\"not found\"}"),
            _ => (405, "{\"status\":\"method not allowed\"}"),
        };
        byte[] bytes = Encoding.UTF8.GetBytes(body);
        response.StatusCode = status;
        response.ContentType = "application/json";
        response.ContentLength64 = bytes.Length;
        response.OutputStream.Write(bytes);
    }

    private (int Status, string Body) Live(HealthOptions settings)
    {
        TimeSpan allowance = daemon.Value.PollInterval * settings.LivenessPollIntervals;
        return health.IsAlive(allowance)
            ? (200, "{\"status\":\"alive\"}")
            : (503, "{\"status\":\"stalled\"}");
    }

    private (int Status, string Body) Ready() =>
        health.DatabaseReady
            ? (200, "{\"status\":\"ready\"}")
            : (503, "{\"status\":\"not ready\",\"reason\":" + System.Text.Json.JsonSerializer.Serialize(health.DatabaseProblem) + "}");

    [LoggerMessage(EventId = 1101, Level = LogLevel.Information, Message = "Health endpoint listening on {Address}:{Port}")]
    private static partial void LogListening(ILogger logger, string address, int port);
}
