using System.Diagnostics;
using System.Text.Json;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Http;

/// <summary>A real Prometheus server scrapes a running daemon over 127.0.0.1, as an operator's would.</summary>
public sealed class PrometheusScrapeTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    [PrometheusFact]
    public async Task Prometheus_scrapes_the_daemon_and_sees_its_runs()
    {
        await DaemonTestData.PrepareAsync(database, hours: 48);
        await DaemonTestData.RegisterAsync(database, TimeProvider.System, "scraped-model");
        await DaemonTestData.ScalarAsync(database.DataSource, "WITH d AS (UPDATE modelwatch.model SET next_due_slot = '2026-01-02T00:00:00Z' WHERE key = 'scraped-model' RETURNING 1) SELECT count(*) FROM d");
        int daemonPort = HostedDaemon.FreePort();
        int prometheusPort = HostedDaemon.FreePort();
        await using HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://127.0.0.1:{daemonPort}",
            ["Telemetry:PrometheusEnabled"] = "true",
        });

        string folder = Directory.CreateTempSubdirectory("mw-prometheus-").FullName;
        File.WriteAllText(Path.Combine(folder, "prometheus.yml"), $"""
            global:
              scrape_interval: 1s
            scrape_configs:
              - job_name: modelwatch
                static_configs:
                  - targets: ['127.0.0.1:{daemonPort}']
            """);
        using Process prometheus = Process.Start(new ProcessStartInfo(PrometheusFactAttribute.Binary)
        {
            ArgumentList =
            {
                "--config.file=" + Path.Combine(folder, "prometheus.yml"),
                "--storage.tsdb.path=" + Path.Combine(folder, "data"),
                "--web.listen-address=127.0.0.1:" + prometheusPort,
            },
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        })!;
        try
        {
            using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{prometheusPort}/") };
            string? model = null;
            string? job = null;
            long started = TimeProvider.System.GetTimestamp();
            while (model is null)
            {
                Assert.True(TimeProvider.System.GetElapsedTime(started) < TimeSpan.FromSeconds(90), "Prometheus never saw modelwatch_runs_total");
                await Task.Delay(500);
                try
                {
                    using JsonDocument answer = JsonDocument.Parse(await http.GetStringAsync("api/v1/query?query=modelwatch_runs_total"));
                    foreach (JsonElement series in answer.RootElement.GetProperty("data").GetProperty("result").EnumerateArray())
                    {
                        JsonElement labels = series.GetProperty("metric");
                        if (labels.TryGetProperty("modelwatch_model", out JsonElement m) && m.GetString() == "scraped-model")
                        {
                            model = m.GetString();
                            job = labels.GetProperty("job").GetString();
                        }
                    }
                }
                catch (HttpRequestException)
                {
                    // Prometheus is still starting.
                }
            }

            Assert.Equal("modelwatch", job);
            using JsonDocument up = JsonDocument.Parse(await http.GetStringAsync("api/v1/query?query=up%7Bjob%3D%22modelwatch%22%7D"));
            Assert.Equal("1", up.RootElement.GetProperty("data").GetProperty("result")[0].GetProperty("value")[1].GetString());
        }
        finally
        {
            prometheus.Kill();
            await prometheus.WaitForExitAsync();
            Directory.Delete(folder, recursive: true);
        }
    }
}
