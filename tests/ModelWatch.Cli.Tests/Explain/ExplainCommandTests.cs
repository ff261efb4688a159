using System.Net;
using System.Runtime.CompilerServices;
using System.Text.Json;
using System.Text.RegularExpressions;
using ModelWatch.Daemon.Evidence;
using ModelWatch.Testing.Postgres;
using Xunit.Abstractions;

namespace ModelWatch.Cli.Tests.Explain;

/// <summary>
/// <c>modelwatch explain</c> on a real PostgreSQL, over runs, findings and alerts the real daemon recorded for the
/// invented ferry scenario; the HTML report rendered in headless Chromium.
/// </summary>
public sealed partial class ExplainCommandTests(PostgresDatabase database, ITestOutputHelper log) : IClassFixture<PostgresDatabase>
{
    // The daemon runs once per database (one per test class), however many tests ask for it.
    private static readonly ConditionalWeakTable<PostgresDatabase, Task> Scenarios = [];

    private const string Measure = """
        <script>
        (function () {
          var charts = [];
          document.querySelectorAll('figure.chart').forEach(function (figure) {
            var shapes = 0, sized = 0;
            figure.querySelectorAll('svg .data').forEach(function (shape) {
              var box = shape.getBoundingClientRect();
              shapes++;
              if (box.width > 0 && box.height > 0) { sized++; }
            });
            var svg = figure.querySelector('svg').getBoundingClientRect();
            charts.push({ chart: figure.dataset.chart, shapes: shapes, sized: sized, width: svg.width, height: svg.height });
          });
          var pre = document.createElement('pre');
          pre.id = 'measured';
          pre.textContent = JSON.stringify(charts);
          document.body.appendChild(pre);
        })();
        </script>
        """;

    [Fact]
    public async Task Explain_an_alert_prints_what_moved_the_decomposition_the_features_and_the_runbook()
    {
        long alert = await CoefficientsAlertAsync();

        CliRun run = await FerryScenario.Cli(database, "explain", alert.ToString(System.Globalization.CultureInfo.InvariantCulture));
        log.WriteLine(run.Output);

        Assert.True(run.ExitCode == 0, run.Error);
        Assert.StartsWith($"alert {alert}: model {FerryScenario.Key}, check coefficients, subject model, critical, open", run.Output, StringComparison.Ordinal);
        Assert.Matches(@"What moved \(\d+ critical finding\(s\) in run \d+\):", run.Output);
        Assert.Contains("[critical] coefficients wald (model): all coefficients of the window's refit against the deployed ones", run.Output, StringComparison.Ordinal);
        Assert.Contains("[critical] coefficients z (trucks): coefficient of trucks on the window's refit moved from", run.Output, StringComparison.Ordinal);
        Assert.Matches(@"of the error increase over baseline: noise -?\d+ %, level drift -?\d+ %, slope drift \d+ %\n  How to read the shares: ", run.Output);
        Assert.Matches(@"Features involved: trucks\b", run.Output);
        Assert.Contains("Runbook, coefficients:", run.Output, StringComparison.Ordinal);
        Assert.Contains(RunbookHints.For("coefficients")!.Act, run.Output, StringComparison.Ordinal);
        Assert.Contains(RunbookHints.Caution, run.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Explain_a_run_prints_its_window_and_findings()
    {
        await ScenarioAsync();
        long first = await FerryScenario.ScalarAsync(database, $"SELECT min(id) FROM modelwatch.run WHERE model_key = '{FerryScenario.Key}'");
        long last = await FerryScenario.ScalarAsync(database, $"SELECT last_run_id FROM modelwatch.alert WHERE model_key = '{FerryScenario.Key}' AND check_name = 'coefficients' AND subject IS NULL");

        CliRun before = await FerryScenario.Cli(database, "explain", "--run", first.ToString(System.Globalization.CultureInfo.InvariantCulture));
        CliRun after = await FerryScenario.Cli(database, "explain", "--run", last.ToString(System.Globalization.CultureInfo.InvariantCulture));
        log.WriteLine(before.Output);

        Assert.True(before.ExitCode == 0, before.Error);
        Assert.StartsWith($"run {first}: model {FerryScenario.Key}", before.Output, StringComparison.Ordinal);
        Assert.Matches($@"\n  run {first}: window 2026-04-0\dT\d\d:00:00Z → 2026-04-0\dT\d\d:00:00Z, ok, 60 rows\n", before.Output);
        Assert.DoesNotContain("[critical]", before.Output, StringComparison.Ordinal);
        Assert.True(after.ExitCode == 0, after.Error);
        Assert.StartsWith($"run {last}: model {FerryScenario.Key}", after.Output, StringComparison.Ordinal);
        Assert.Contains("[critical] coefficients wald (model)", after.Output, StringComparison.Ordinal);
        Assert.Contains(RunbookHints.Caution, after.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Explain_an_id_that_names_nothing_exits_3_and_a_missing_or_double_id_is_usage()
    {
        await ScenarioAsync();
        long unusedAlert = await FerryScenario.ScalarAsync(database, "SELECT last_value + 1000 FROM modelwatch.alert_id");
        long unusedRun = await FerryScenario.ScalarAsync(database, "SELECT last_value + 1000 FROM modelwatch.object_id");

        CliRun alert = await FerryScenario.Cli(database, "explain", unusedAlert.ToString(System.Globalization.CultureInfo.InvariantCulture));
        CliRun run = await FerryScenario.Cli(database, "explain", "--run", unusedRun.ToString(System.Globalization.CultureInfo.InvariantCulture));
        CliRun neither = await FerryScenario.Cli(database, "explain");
        CliRun both = await FerryScenario.Cli(database, "explain", "1", "--run", "1");

        Assert.Equal(ExitCodes.RuntimeError, alert.ExitCode);
        Assert.Contains($"no alert has id {unusedAlert} (for a run, use --run RUN_ID)", alert.Error, StringComparison.Ordinal);
        Assert.Equal(string.Empty, alert.Output);
        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains($"no run has id {unusedRun}", run.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Usage, neither.ExitCode);
        Assert.Contains("give an alert id, or --run RUN_ID for a run", neither.Error, StringComparison.Ordinal);
        Assert.Equal(ExitCodes.Usage, both.ExitCode);
        Assert.Contains("not both", both.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task The_html_report_draws_every_chart_in_headless_chromium()
    {
        string chromium = HeadlessChromium.Executable;
        long alert = await CoefficientsAlertAsync();
        string folder = Path.Combine(AppContext.BaseDirectory, "evidence-report");
        Directory.CreateDirectory(folder);
        string report = Path.Combine(folder, "report.html");

        CliRun run = await FerryScenario.Cli(database, "explain", alert.ToString(System.Globalization.CultureInfo.InvariantCulture), "--html", report);
        string html = await File.ReadAllTextAsync(report);
        string measured = Path.Combine(folder, "measured.html");
        await File.WriteAllTextAsync(measured, html.Replace("</body>", Measure + "</body>", StringComparison.Ordinal));
        string dom = await HeadlessChromium.DumpDomAsync(measured);
        await HeadlessChromium.ScreenshotAsync(report, Path.Combine(folder, "report.png"), 1200, 2400);

        Assert.True(run.ExitCode == 0, chromium + ": " + run.Error);
        Assert.Contains("report: " + report, run.Output, StringComparison.Ordinal);
        Assert.DoesNotMatch(@"<script|https?://|\burl\(|@import|<link|\bsrc=", html);
        Assert.Contains(WebUtility.HtmlEncode(RunbookHints.Caution), html, StringComparison.Ordinal);

        // Axes carry titles with the spec's unit and dated UTC ticks; the alert's open period is shaded and its
        // evidence run marked; the alert's own charts (a model-wide coefficients alert: every coefficient) come first.
        Assert.Contains(WebUtility.HtmlEncode("↑ coefficient (minutes per unit of trucks)"), html, StringComparison.Ordinal);
        Assert.Contains(WebUtility.HtmlEncode("↑ RMSE (minutes)"), html, StringComparison.Ordinal);
        Assert.Contains(WebUtility.HtmlEncode("end of each run's window (UTC)"), html, StringComparison.Ordinal);
        Assert.Matches(@"class=""tick xtick( alt)?"" text-anchor=""\w+"">2026-04-0\d<tspan x=""[\d.]+"" dy=""1.15em"">\d\d:00</tspan>", html);
        Assert.Contains("class=\"period\"", html, StringComparison.Ordinal);
        Assert.Matches($@"<li><span class=""key marker"" style=""--key:#[0-9a-f]{{6}}""></span>evidence run #\d+</li>", html);
        string own = html[html.IndexOf("The alert&#39;s own evidence", StringComparison.Ordinal)..html.IndexOf("The rest of the model", StringComparison.Ordinal)];
        Assert.Equal(4, Regex.Count(own, "data-chart=\"coefficient\""));
        Assert.DoesNotContain("data-chart=\"error\"", own, StringComparison.Ordinal);
        Assert.Contains("How to read the shares", html, StringComparison.Ordinal);
        Match result = MeasuredRegex().Match(dom);
        Assert.True(result.Success, "the measuring script wrote nothing: " + dom[..Math.Min(dom.Length, 500)]);
        using JsonDocument charts = JsonDocument.Parse(WebUtility.HtmlDecode(result.Groups[1].Value));
        var byKind = charts.RootElement.EnumerateArray().GroupBy(c => c.GetProperty("chart").GetString()!).ToDictionary(g => g.Key, g => g.ToList());
        Assert.Equal(["coefficient", "condition", "decomposition", "error", "psi", "residuals", "vif"], byKind.Keys.Order(StringComparer.Ordinal));
        Assert.Equal(4, byKind["coefficient"].Count);
        foreach (JsonElement chart in charts.RootElement.EnumerateArray())
        {
            string name = chart.GetProperty("chart").GetString()!;
            Assert.True(chart.GetProperty("width").GetDouble() > 250 && chart.GetProperty("height").GetDouble() > 100, $"{name}: the chart has no size ({chart})");
            Assert.True(chart.GetProperty("sized").GetInt32() >= 3, $"{name}: fewer than 3 data shapes of non-zero size ({chart})");
        }

        // The residual chart shows both the baseline's bars and this window's curve; the PSI chart one bar per feature.
        Assert.True(byKind["residuals"][0].GetProperty("sized").GetInt32() >= 10);
        Assert.True(byKind["psi"][0].GetProperty("sized").GetInt32() >= 3);
    }

    private async Task<long> CoefficientsAlertAsync()
    {
        await ScenarioAsync();
        return await FerryScenario.ScalarAsync(database, $"SELECT id FROM modelwatch.alert WHERE model_key = '{FerryScenario.Key}' AND check_name = 'coefficients' AND subject IS NULL");
    }

    private Task ScenarioAsync()
    {
        lock (Scenarios)
        {
            return Scenarios.GetValue(database, FerryScenario.RunAsync);
        }
    }

    [GeneratedRegex("<pre id=\"measured\">(.*?)</pre>", RegexOptions.Singleline)]
    private static partial Regex MeasuredRegex();
}
