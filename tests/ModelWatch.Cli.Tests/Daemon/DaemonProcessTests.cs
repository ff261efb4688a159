using System.Net;
using System.Net.Sockets;
using ModelWatch.Store.Migrations;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Cli.Tests.Daemon;

/// <summary><c>modelwatch daemon</c> as a process: exit codes that tell the truth, and one configuration path for every command.</summary>
public sealed class DaemonProcessTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>, IDisposable
{
    private static readonly TimeSpan Limit = TimeSpan.FromSeconds(60);
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-daemon-process-").FullName;

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Every_configuration_problem_in_every_section_is_listed_with_exit_three_and_no_stack_trace()
    {
        using ModelWatchProcess daemon = ModelWatchProcess.Start(new Dictionary<string, string>
        {
            ["ConnectionStrings__State"] = database.ConnectionString,
            ["Daemon__Concurrency"] = "0",
            ["Http__Enabled"] = "true",
            ["Http__Urls"] = "https://127.0.0.1:9464",
            ["Notifications__Targets__pager__Url"] = "not a url",
            ["Notifications__Targets__pager__Secret"] = "short",
            ["Telemetry__CardinalityLimit"] = "1",
            ["Health__Enabled"] = "true",
        }, _folder, "daemon");

        Assert.Equal(3, await daemon.ExitCodeAsync(Limit));
        string error = daemon.Error;
        Assert.Contains("modelwatch daemon: configuration: Health is no longer read", error, StringComparison.Ordinal);
        Assert.Contains("modelwatch daemon: configuration: Daemon:Concurrency: ", error, StringComparison.Ordinal);
        Assert.Contains("modelwatch daemon: configuration: Http:Urls: 'https://127.0.0.1:9464' is not served", error, StringComparison.Ordinal);
        Assert.Contains("modelwatch daemon: configuration: Telemetry:CardinalityLimit: ", error, StringComparison.Ordinal);
        Assert.Contains("modelwatch daemon: configuration: Notifications:Targets:pager: ", error, StringComparison.Ordinal);
        Assert.Contains("configuration problem(s); nothing started", error, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", error, StringComparison.Ordinal);
        Assert.DoesNotContain("Exception", error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_requested_stop_exits_zero_and_requests_of_any_method_leave_it_running()
    {
        int port = FreePort();
        File.WriteAllText(Path.Combine(_folder, "settings.json"), $$"""
            { "Http": { "Enabled": true, "Urls": "http://127.0.0.1:{{port}}" }, "Telemetry": { "PrometheusEnabled": true } }
            """);
        using ModelWatchProcess daemon = ModelWatchProcess.Start(new Dictionary<string, string>
        {
            ["ConnectionStrings__State"] = database.ConnectionString,
            ["MODELWATCH_SETTINGS"] = "settings.json",
            ["Daemon__PollInterval"] = "00:00:01",
            ["Daemon__Concurency"] = "3",
        }, _folder, "daemon");
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };
        await UntilLiveAsync(http, daemon);

        // The request that used to stop the daemon (a POST with no body), and friends.
        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await http.PostAsync("healthz/live", null)).StatusCode);
        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await http.PutAsync("metrics", new StringContent(new string('x', 100_000)))).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("healthz/live")).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("metrics")).StatusCode);

        daemon.Terminate();
        Assert.Equal(0, await daemon.ExitCodeAsync(Limit));

        // The misspelt key is named in the log, with the keys it could have meant; times are UTC.
        Assert.Contains("Daemon:Concurency is not a setting ModelWatch reads (known under Daemon: WorkerId, Concurrency,", daemon.Output, StringComparison.Ordinal);
        Assert.Matches(@"(?m)^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z (INF|WRN) ", daemon.Output);
    }

    [Fact]
    public async Task An_address_already_in_use_is_one_line_and_exit_three()
    {
        using var taken = new TcpListener(IPAddress.Loopback, 0);
        taken.Start();
        int port = ((IPEndPoint)taken.LocalEndpoint).Port;
        using ModelWatchProcess daemon = ModelWatchProcess.Start(new Dictionary<string, string>
        {
            ["ConnectionStrings__State"] = database.ConnectionString,
            ["Http__Enabled"] = "true",
            ["Http__Urls"] = $"http://127.0.0.1:{port}",
        }, _folder, "daemon");

        Assert.Equal(3, await daemon.ExitCodeAsync(Limit));
        Assert.Contains($"modelwatch daemon: the HTTP endpoint cannot listen (Http:Urls):", daemon.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", daemon.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task An_address_this_host_does_not_have_is_one_line_and_exit_three()
    {
        using ModelWatchProcess daemon = ModelWatchProcess.Start(new Dictionary<string, string>
        {
            ["ConnectionStrings__State"] = database.ConnectionString,
            ["Http__Enabled"] = "true",
            ["Http__Urls"] = "http://192.0.2.1:9464",
        }, _folder, "daemon");

        Assert.Equal(3, await daemon.ExitCodeAsync(Limit));
        Assert.Contains("modelwatch daemon: the HTTP endpoint cannot listen (Http:Urls):", daemon.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Commands_read_the_settings_file_named_by_the_environment_as_the_daemon_does()
    {
        await MigrationRunner.MigrateAsync(database.DataSource, TimeSpan.FromMinutes(1), CancellationToken.None);
        File.WriteAllText(Path.Combine(_folder, "elsewhere.json"), $$"""{ "ConnectionStrings": { "State": "{{database.ConnectionString}}" } }""");
        using ModelWatchProcess list = ModelWatchProcess.Start(new Dictionary<string, string> { ["MODELWATCH_SETTINGS"] = "elsewhere.json" }, _folder, "model", "list");

        Assert.Equal(0, await list.ExitCodeAsync(Limit));
        Assert.DoesNotContain("no state database", list.Error, StringComparison.Ordinal);
    }

    private static async Task UntilLiveAsync(HttpClient http, ModelWatchProcess daemon)
    {
        long started = TimeProvider.System.GetTimestamp();
        while (true)
        {
            try
            {
                if ((await http.GetAsync("healthz/live")).StatusCode == HttpStatusCode.OK)
                {
                    return;
                }
            }
            catch (HttpRequestException)
            {
                // Not listening yet.
            }

            Assert.True(TimeProvider.System.GetElapsedTime(started) < Limit, "the daemon never answered: " + daemon.Error + daemon.Output);
            await Task.Delay(200);
        }
    }

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
