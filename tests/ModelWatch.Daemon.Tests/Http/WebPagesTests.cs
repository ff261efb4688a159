using System.Collections.Concurrent;
using System.Net;
using System.Net.Http.Headers;
using System.Runtime.CompilerServices;
using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Tests.Notifications;
using ModelWatch.Daemon.Tests.Support;
using ModelWatch.Testing.Postgres;

namespace ModelWatch.Daemon.Tests.Http;

/// <summary>
/// The evidence pages (<c>Web:Enabled</c>) served by the real daemon host over 127.0.0.1, over runs, findings and
/// alerts that the real daemon recorded on a fake clock for invented parcel data whose minutes per km double six hours
/// into monitoring; the alert's webhook carries the page's address; Chromium renders the pages.
/// </summary>
public sealed partial class WebPagesTests(PostgresDatabase database) : IClassFixture<PostgresDatabase>
{
    private const string Key = "parcels-web";
    private const string Secret = "web-pages-webhook-secret";
    private const string PublicBase = "https://modelwatch.example.org/";
    private const string Token = "web-pages-test-token-0123456789";

    // The recorded history is made once per database (one per test class), however many tests ask for it.
    private static readonly ConditionalWeakTable<PostgresDatabase, Task<Scenario>> Scenarios = [];

    // Lays each chart and table out and writes what it measured into the DOM; added only to a test's copy of a page.
    private const string Measure = """
        <script>
        (function () {
          var out = { width: window.innerWidth, scrollWidth: document.documentElement.scrollWidth, charts: [], tables: [], rows: [] };
          document.querySelectorAll('figure.chart').forEach(function (figure) {
            var sized = 0;
            figure.querySelectorAll('svg .data').forEach(function (s) { var b = s.getBoundingClientRect(); if (b.width > 0 && b.height > 0) { sized++; } });
            var svg = figure.querySelector('svg').getBoundingClientRect();
            out.charts.push({ chart: figure.dataset.chart, width: svg.width, height: svg.height, sized: sized });
          });
          document.querySelectorAll('table').forEach(function (t) { var b = t.getBoundingClientRect(); out.tables.push({ width: b.width, height: b.height, right: b.right }); });
          document.querySelectorAll('.charts').forEach(function (grid) {
            var g = grid.getBoundingClientRect(), rows = {};
            Array.prototype.forEach.call(grid.children, function (c) { var b = c.getBoundingClientRect(); var k = Math.round(b.top); rows[k] = Math.max(rows[k] || 0, b.right); });
            Object.keys(rows).forEach(function (k) { out.rows.push({ gap: g.right - rows[k] }); });
          });
          var pre = document.createElement('pre'); pre.id = 'measured'; pre.textContent = JSON.stringify(out); document.body.appendChild(pre);
        })();
        </script>
        """;

    [Fact]
    public async Task The_pages_answer_read_only_with_no_store_a_content_policy_escaped_text_and_404_pages()
    {
        Scenario scenario = await ScenarioAsync();
        (HostedDaemon daemon, HttpClient http, _) = await StartAsync(scenario, token: null);
        await using HostedDaemon running = daemon;
        using HttpClient client = http;

        HttpResponseMessage fleet = await client.GetAsync("/");
        string fleetHtml = await fleet.Content.ReadAsStringAsync();
        HttpResponseMessage model = await client.GetAsync($"/models/{Key}");
        string modelHtml = await model.Content.ReadAsStringAsync();
        HttpResponseMessage alert = await client.GetAsync($"/alerts/{scenario.AlertId}");
        string alertHtml = await alert.Content.ReadAsStringAsync();

        foreach (HttpResponseMessage page in new[] { fleet, model, alert })
        {
            Assert.Equal(HttpStatusCode.OK, page.StatusCode);
            Assert.Equal("text/html; charset=utf-8", page.Content.Headers.ContentType?.ToString());
            Assert.True(page.Headers.CacheControl?.NoStore, "Cache-Control: no-store missing");
            Assert.StartsWith("default-src 'none'", string.Join(";", page.Headers.GetValues("Content-Security-Policy")), StringComparison.Ordinal);
        }

        Assert.Contains($"<a href=\"/models/{Key}\">{Key}</a>", fleetHtml, StringComparison.Ordinal);
        Assert.Matches(@"<td data-label=""open alerts""><span class=""sev critical"">\d+ critical, \d+ warning</span></td>", fleetHtml);
        Assert.Contains($"<a href=\"/alerts/{scenario.AlertId}\">#{scenario.AlertId} evidence</a>", modelHtml, StringComparison.Ordinal);
        Assert.Contains("<h2>Recent runs</h2>", modelHtml, StringComparison.Ordinal);
        Assert.Contains(WebUtility.HtmlEncode($"critical alert #{scenario.AlertId}: coefficients (model) · model {Key}"), alertHtml, StringComparison.Ordinal);
        Assert.Contains("How to read the shares", alertHtml, StringComparison.Ordinal);

        // No page asks for anything outside itself.
        foreach (string html in new[] { fleetHtml, modelHtml, alertHtml })
        {
            Assert.DoesNotMatch(@"<script|https?://|\burl\(|@import|<link|\bsrc=", html);
        }

        // Text from the database is escaped: a run's reason written with markup shows as text.
        Assert.DoesNotContain("<b>injected</b>", modelHtml, StringComparison.Ordinal);
        Assert.Contains("&lt;b&gt;injected&lt;/b&gt;", modelHtml, StringComparison.Ordinal);

        HttpResponseMessage head = await client.SendAsync(new HttpRequestMessage(HttpMethod.Head, "/"));
        Assert.Equal(HttpStatusCode.OK, head.StatusCode);
        Assert.Empty(await head.Content.ReadAsByteArrayAsync());

        foreach (string missing in new[] { "/models/no-such-model", "/alerts/987654321", "/alerts/abc", "/alerts/-1", "/models/%3Cscript%3E" })
        {
            HttpResponseMessage notFound = await client.GetAsync(missing);
            string body = await notFound.Content.ReadAsStringAsync();
            Assert.True(notFound.StatusCode == HttpStatusCode.NotFound, $"{missing}: {notFound.StatusCode}");
            Assert.Contains("<h1>No such", body, StringComparison.Ordinal);
            Assert.DoesNotContain("<script>", body, StringComparison.Ordinal);
        }

        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await client.PostAsync("/", null)).StatusCode);
        Assert.Equal(HttpStatusCode.MethodNotAllowed, (await client.DeleteAsync($"/alerts/{scenario.AlertId}")).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync("/healthz/live")).StatusCode);
    }

    [Fact]
    public async Task With_an_access_token_every_page_needs_it_health_does_not_and_the_token_is_never_logged()
    {
        Scenario scenario = await ScenarioAsync();
        (HostedDaemon daemon, HttpClient http, _) = await StartAsync(scenario, token: Token);
        await using HostedDaemon running = daemon;
        using HttpClient client = http;

        foreach (string path in new[] { "/", $"/models/{Key}", $"/alerts/{scenario.AlertId}", "/alerts/987654321" })
        {
            HttpResponseMessage none = await client.GetAsync(path);
            Assert.Equal(HttpStatusCode.Unauthorized, none.StatusCode);
            Assert.Equal("Bearer realm=\"modelwatch\"", none.Headers.WwwAuthenticate.ToString());
            Assert.DoesNotContain(Key, await none.Content.ReadAsStringAsync(), StringComparison.Ordinal);

            foreach (string wrong in new[] { "Bearer " + Token[..^1], "Bearer " + Token + "x", "Basic " + Token, Token })
            {
                using var request = new HttpRequestMessage(HttpMethod.Get, path);
                request.Headers.TryAddWithoutValidation("Authorization", wrong);
                Assert.Equal(HttpStatusCode.Unauthorized, (await client.SendAsync(request)).StatusCode);
            }
        }

        client.DefaultRequestHeaders.Authorization = new AuthenticationHeaderValue("Bearer", Token);
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync("/")).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync($"/alerts/{scenario.AlertId}")).StatusCode);
        Assert.Equal(HttpStatusCode.NotFound, (await client.GetAsync("/alerts/987654321")).StatusCode);
        client.DefaultRequestHeaders.Authorization = null;
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync("/healthz/live")).StatusCode);
        Assert.DoesNotContain(daemon.Logs.Records, e => e.Message.Contains(Token, StringComparison.Ordinal));
    }

    [Fact]
    public async Task The_webhook_carries_the_evidence_url_and_the_pages_are_off_unless_enabled()
    {
        Scenario scenario = await ScenarioAsync();

        JsonElement payload = scenario.Webhooks.Select(b => JsonDocument.Parse(b).RootElement)
            .First(p => p.GetProperty("alert").GetProperty("id").GetInt64() == scenario.AlertId);
        Assert.Equal($"https://modelwatch.example.org/alerts/{scenario.AlertId}", payload.GetProperty("alert").GetProperty("evidence_url").GetString());

        // Http on, Web off: only health answers.
        int port = HostedDaemon.FreePort();
        await using HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://127.0.0.1:{port}",
        }, services => services.AddSingleton<TimeProvider>(new FakeTimeProvider(scenario.End)));
        using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") };
        Assert.Equal(HttpStatusCode.NotFound, (await http.GetAsync("/")).StatusCode);
        Assert.Equal(HttpStatusCode.NotFound, (await http.GetAsync($"/alerts/{scenario.AlertId}")).StatusCode);
    }

    [Fact]
    public void Web_settings_that_cannot_work_stop_the_start_and_unknown_ones_are_named()
    {
        (IReadOnlyList<string> problems, IReadOnlyList<string> warnings) = DaemonSettings.Audit(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["Web:Enabled"] = "true",
            ["Web:PublicBaseUrl"] = "/modelwatch",
            ["Web:AccessToken"] = "short secret",
            ["Web:Enabeld"] = "true",
        }).Build());

        Assert.Contains("Web:Enabled needs Http:Enabled: the pages are served on Http:Urls", problems);
        Assert.Contains(problems, p => p.StartsWith("Web:PublicBaseUrl must be an absolute http:// or https:// URL", StringComparison.Ordinal) && p.Contains("'/modelwatch'", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Web:AccessToken must be at least 16 characters", StringComparison.Ordinal));
        Assert.DoesNotContain(problems, p => p.Contains("short secret", StringComparison.Ordinal));
        Assert.Contains(warnings, w => w.StartsWith("Web:Enabeld is not a setting ModelWatch reads (known under Web: Enabled, AccessToken, PublicBaseUrl)", StringComparison.Ordinal));

        (IReadOnlyList<string> fine, _) = DaemonSettings.Audit(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["Http:Enabled"] = "true",
            ["Web:Enabled"] = "true",
            ["Web:PublicBaseUrl"] = "https://modelwatch.example.org/watch",
            ["Web:AccessToken"] = Token,
        }).Build());
        Assert.Empty(fine);
    }

    [ChromiumFact]
    public async Task Chromium_renders_every_page_at_desktop_and_phone_width_with_sized_charts_fitting_tables_and_no_request_elsewhere()
    {
        Scenario scenario = await ScenarioAsync();
        (HostedDaemon daemon, HttpClient http, RequestLog log) = await StartAsync(scenario, token: null);
        await using HostedDaemon running = daemon;
        using HttpClient client = http;
        string folder = Path.Combine(AppContext.BaseDirectory, "web-pages");
        Directory.CreateDirectory(folder);
        int port = client.BaseAddress!.Port;

        foreach ((string name, string path, int minCharts) in new[] { ("fleet", "/", 0), ("model", $"/models/{Key}", 6), ("alert", $"/alerts/{scenario.AlertId}", 6) })
        {
            // Served: every host name leads to this daemon, so a request for another origin would arrive with its Host.
            string dom = await WebBrowser.DumpDomAsync($"http://127.0.0.1:{port}{path}", 1200, everyHostTo: port);
            Assert.Contains("</main>", dom, StringComparison.Ordinal);

            string html = await client.GetStringAsync(path);
            foreach (int width in new[] { 1200, 390 })
            {
                // Headless Chromium lays a window out at least 500 px wide; a frame gives the page a true phone width.
                string measured = Path.Combine(folder, $"{name}-{width}.html");
                await File.WriteAllTextAsync(measured, Framed(html.Replace("</body>", Measure + "</body>", StringComparison.Ordinal), width));
                await WebBrowser.ScreenshotAsync(new Uri(measured).AbsoluteUri, Path.Combine(folder, $"{name}-{width}.png"), Math.Max(width, 500), 2400);
                Match found = MeasuredRegex().Match(await WebBrowser.DumpDomAsync(new Uri(measured).AbsoluteUri, Math.Max(width, 500)));
                Assert.True(found.Success, $"{name} at {width}: the measuring script wrote nothing");
                using JsonDocument result = JsonDocument.Parse(WebUtility.HtmlDecode(found.Groups[1].Value));
                JsonElement root = result.RootElement;
                string context = $"{name} at {width} px: {root}";
                Assert.True(root.GetProperty("scrollWidth").GetDouble() <= root.GetProperty("width").GetDouble() + 1, "the page scrolls sideways; " + context);
                JsonElement[] charts = [.. root.GetProperty("charts").EnumerateArray()];
                Assert.True(charts.Length >= minCharts, $"fewer than {minCharts} charts; " + context);
                foreach (JsonElement chart in charts)
                {
                    Assert.True(chart.GetProperty("width").GetDouble() >= Math.Min(300, width - 60) && chart.GetProperty("height").GetDouble() > 150, "a chart has no readable size; " + context);
                    Assert.True(chart.GetProperty("sized").GetInt32() >= 3, "a chart has fewer than 3 visible data shapes; " + context);
                }

                foreach (JsonElement table in root.GetProperty("tables").EnumerateArray())
                {
                    Assert.True(table.GetProperty("width").GetDouble() > 0 && table.GetProperty("right").GetDouble() <= width, "a table runs off the page; " + context);
                }

                // Every row of every chart grid reaches the grid's right edge: no half row is left empty.
                Assert.All(root.GetProperty("rows").EnumerateArray(), row => Assert.True(row.GetProperty("gap").GetDouble() < 2, "a chart row leaves space empty; " + context));
            }
        }

        // Requests a page makes carry Sec-Fetch-Dest; the browser's own housekeeping (update and clock checks, which the
        // resolver rule also sends here) carries none and is not the page's doing.
        List<(string Host, string Path, string? Dest)> fromPages = [.. log.Requests.Where(r => r.Dest is not null)];
        Assert.Contains(fromPages, r => r.Path == $"/alerts/{scenario.AlertId}" && r.Dest == "document");
        Assert.All(fromPages, r => Assert.Equal($"127.0.0.1:{port}", r.Host));
    }

    /// <summary>The page inside a frame of the given width; the frame's measurements are copied out once it has loaded.</summary>
    private static string Framed(string html, int width) =>
        "<!DOCTYPE html><html><body style=\"margin:0\">" +
        $"<iframe id=\"page\" style=\"width:{width}px;height:2400px;border:0;display:block\" srcdoc=\"{WebUtility.HtmlEncode(html)}\"></iframe>" +
        "<script>document.getElementById('page').addEventListener('load', function () { var m = this.contentDocument.getElementById('measured');" +
        " var o = document.createElement('pre'); o.id = 'measured'; o.textContent = m ? m.textContent : ''; document.body.appendChild(o); });</script></body></html>";

    private async Task<(HostedDaemon Daemon, HttpClient Http, RequestLog Log)> StartAsync(Scenario scenario, string? token)
    {
        int port = HostedDaemon.FreePort();
        var log = new RequestLog();
        var settings = new Dictionary<string, string?>
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = $"http://127.0.0.1:{port}",
            ["Web:Enabled"] = "true",
        };
        if (token is not null)
        {
            settings["Web:AccessToken"] = token;
        }

        // The clock stays where the recorded history ends, so the daemon records nothing new while the pages are read.
        HostedDaemon daemon = await HostedDaemon.StartAsync(database.ConnectionString, settings, services =>
        {
            services.AddSingleton<TimeProvider>(new FakeTimeProvider(scenario.End));
            services.AddSingleton<IStartupFilter>(log);
        });
        return (daemon, new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}/") }, log);
    }

    private Task<Scenario> ScenarioAsync()
    {
        lock (Scenarios)
        {
            return Scenarios.GetValue(database, RecordAsync);
        }
    }

    private static async Task<Scenario> RecordAsync(PostgresDatabase database)
    {
        const int hours = 12;
        await DaemonTestData.PrepareAsync(database, hours: 24 + hours + 2, breakAtHour: 24 + 6);
        var time = new FakeTimeProvider(DaemonTestData.ReferenceEnd);
        await DaemonTestData.RegisterAsync(database, time, Key, notify: "[hook]");
        using var hook = new LoopbackReceiver();
        await using (var daemon = new DaemonInstance(database, time, "web-recorder", settings: new Dictionary<string, string?>
        {
            ["Notifications:Targets:hook:Url"] = hook.Url,
            ["Notifications:Targets:hook:Secret"] = Secret,
            ["Web:PublicBaseUrl"] = PublicBase,
        }))
        {
            await daemon.StartAsync();
            await daemon.StartNotificationsAsync();
            for (int hour = 1; hour <= hours; hour++)
            {
                await DaemonTestData.StepToAsync(time, DaemonTestData.ReferenceEnd.AddHours(hour), database.DataSource, $"SELECT count(*) FROM modelwatch.run WHERE model_key = '{Key}' AND status <> 'running'", hour);
            }

            await DaemonTestData.StepToAsync(time, time.GetUtcNow(), database.DataSource, "SELECT count(*) FROM modelwatch.notification WHERE state = 'delivered'", 1);
            await daemon.StopAsync();
        }

        long alert = await DaemonTestData.ScalarAsync(database.DataSource, $"SELECT min(id) FROM modelwatch.alert WHERE model_key = '{Key}' AND check_name = 'coefficients' AND subject IS NULL AND severity = 'critical'");

        // A reason with markup, as a data source's error message could carry: the pages must show it as text.
        await using (var mark = database.DataSource.CreateCommand($"UPDATE modelwatch.run SET reason = 'source said <b>injected</b>' WHERE id = (SELECT max(id) FROM modelwatch.run WHERE model_key = '{Key}')"))
        {
            await mark.ExecuteNonQueryAsync();
        }

        return new Scenario(alert, time.GetUtcNow(), [.. hook.Received.Select(r => Encoding.UTF8.GetString(r.Body))]);
    }

    [GeneratedRegex("<pre id=\"measured\">(.*?)</pre>", RegexOptions.Singleline)]
    private static partial Regex MeasuredRegex();

    private sealed record Scenario(long AlertId, DateTimeOffset End, IReadOnlyList<string> Webhooks);

    /// <summary>Every request the daemon's HTTP endpoint received, with the Host it was addressed to.</summary>
    private sealed class RequestLog : IStartupFilter
    {
        public ConcurrentQueue<(string Host, string Path, string? Dest)> Requests { get; } = new();

        public Action<IApplicationBuilder> Configure(Action<IApplicationBuilder> next) => app =>
        {
            app.Use(async (context, following) =>
            {
                string? dest = context.Request.Headers.TryGetValue("Sec-Fetch-Dest", out var value) ? value.ToString() : null;
                Requests.Enqueue((context.Request.Host.Value ?? string.Empty, context.Request.Path.Value ?? string.Empty, dest));
                await following(context);
            });
            next(app);
        };
    }
}
