using Microsoft.Extensions.Configuration;
using ModelWatch.Daemon.Hosting;

namespace ModelWatch.Daemon.Tests.Options;

public sealed class DaemonSettingsTests
{
    [Fact]
    public void Every_problem_in_every_section_is_listed_at_once()
    {
        (IReadOnlyList<string> problems, _) = DaemonSettings.Audit(Settings(new()
        {
            ["Daemon:Concurrency"] = "0",
            ["Daemon:PollInterval"] = "soon",
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = "https://127.0.0.1:9464;http://monitor.internal:9464;http://127.0.0.1",
            ["Retention:BatchSize"] = "-1",
            ["Telemetry:CardinalityLimit"] = "5",
            ["Notifications:Targets:pager:Url"] = "not a url",
            ["Notifications:Targets:pager:Secret"] = "short",
            ["Logging:LogLevel:Default"] = "Loud",
        }));

        Assert.Contains(problems, p => p.StartsWith("Daemon: ", StringComparison.Ordinal) && p.Contains("PollInterval", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Http:Urls: 'https://127.0.0.1:9464' is not served: only http://", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Http:Urls: 'http://monitor.internal:9464' does not name an IP address", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Http:Urls: 'http://127.0.0.1' has no port", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Retention:BatchSize: ", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Telemetry:CardinalityLimit: ", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Notifications:Targets:pager: ", StringComparison.Ordinal) && p.Contains("Url", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Notifications:Targets:pager: ", StringComparison.Ordinal) && p.Contains("Secret", StringComparison.Ordinal));
        Assert.Contains(problems, p => p.StartsWith("Logging:LogLevel:Default: 'Loud' is not a log level", StringComparison.Ordinal));
    }

    [Fact]
    public void A_value_that_does_not_convert_does_not_hide_the_other_sections()
    {
        (IReadOnlyList<string> problems, _) = DaemonSettings.Audit(Settings(new()
        {
            ["Daemon:Concurrency"] = "two",
            ["Retention:BatchSize"] = "0",
        }));

        Assert.Equal(2, problems.Count);
        Assert.StartsWith("Daemon: ", problems[0], StringComparison.Ordinal);
        Assert.Contains("Daemon:Concurrency", problems[0], StringComparison.Ordinal);
        Assert.StartsWith("Retention:BatchSize: ", problems[1], StringComparison.Ordinal);
    }

    [Fact]
    public void Keys_of_earlier_releases_are_errors_that_name_their_replacement()
    {
        (IReadOnlyList<string> problems, IReadOnlyList<string> warnings) = DaemonSettings.Audit(Settings(new()
        {
            ["Health:Enabled"] = "true",
            ["Health:Port"] = "8081",
            ["Telemetry:PrometheusPort"] = "9464",
        }));

        Assert.Equal(
            [
                "Health is no longer read: the health endpoint moved to Http:Enabled and Http:Urls (paths /healthz/live and /healthz/ready)",
                "Telemetry:PrometheusPort is no longer read: the scrape endpoint is /metrics on Http:Urls (set Http:Enabled and Telemetry:PrometheusEnabled)",
            ],
            problems);
        Assert.Empty(warnings);
    }

    [Fact]
    public void A_webhook_target_must_be_http_or_https()
    {
        (IReadOnlyList<string> problems, _) = DaemonSettings.Audit(Settings(new()
        {
            ["Notifications:Targets:files:Url"] = "ftp://files.example.internal/hooks",
            ["Notifications:Targets:files:Secret"] = "a-secret-of-enough-length",
            ["Notifications:Targets:web:Url"] = "https://hooks.example.internal/ok",
            ["Notifications:Targets:web:Secret"] = "a-secret-of-enough-length",
        }));

        Assert.Equal(["Notifications:Targets:files: Url 'ftp://files.example.internal/hooks' is not an http:// or https:// address"], problems);
    }

    [Fact]
    public void The_scrape_endpoint_needs_the_http_endpoint()
    {
        (IReadOnlyList<string> problems, _) = DaemonSettings.Audit(Settings(new() { ["Telemetry:PrometheusEnabled"] = "true" }));

        Assert.Equal(["Telemetry:PrometheusEnabled needs Http:Enabled: the scrape endpoint is /metrics on Http:Urls"], problems);
    }

    [Fact]
    public void Every_interface_and_loopback_addresses_are_accepted()
    {
        (IReadOnlyList<string> problems, _) = DaemonSettings.Audit(Settings(new()
        {
            ["Http:Enabled"] = "true",
            ["Http:Urls"] = "http://0.0.0.0:9464; http://[::]:9465; http://localhost:9466; http://*:9467; http://[::1]:9468/",
            ["Telemetry:PrometheusEnabled"] = "true",
        }));

        Assert.Empty(problems);
    }

    [Fact]
    public void A_typo_in_a_key_is_a_warning_that_names_it_and_what_is_known()
    {
        (IReadOnlyList<string> problems, IReadOnlyList<string> warnings) = DaemonSettings.Audit(Settings(new()
        {
            ["Daemon:Concurency"] = "4",
            ["Notifications:Targets:pager:Url"] = "https://hooks.example.internal/pager",
            ["Notifications:Targets:pager:Secret"] = "a-secret-of-enough-length",
            ["Notifications:Targets:pager:MinimumSeverty"] = "critical",
            ["Sources:shop:Conection"] = "Host=shop",
            ["Serilog:MinimumLevel"] = "Debug",
        }));

        Assert.Empty(problems);
        Assert.Equal(3, warnings.Count);
        Assert.StartsWith("Daemon:Concurency is not a setting ModelWatch reads (known under Daemon: WorkerId, Concurrency, ", warnings[0], StringComparison.Ordinal);
        Assert.StartsWith("Notifications:Targets:pager:MinimumSeverty is not a setting ModelWatch reads (known under Notifications: Url, Secret, MinimumSeverity", warnings[1], StringComparison.Ordinal);
        Assert.Equal("Sources:shop:Conection is not a setting ModelWatch reads (known under Sources: ConnectionString, StatementTimeout); it is ignored", warnings[2]);
    }

    private static IConfiguration Settings(Dictionary<string, string?> values) => new ConfigurationBuilder().AddInMemoryCollection(values).Build();
}
