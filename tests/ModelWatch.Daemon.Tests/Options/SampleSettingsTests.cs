using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Execution;
using ModelWatch.Daemon.Options;
using ModelWatch.Store.Specs;

namespace ModelWatch.Daemon.Tests.Options;

public sealed class SampleSettingsTests
{
    [Fact]
    public void The_sample_settings_bind_and_pass_validation()
    {
        string path = Path.Combine(RepositoryRoot(), "sample-config", "appsettings.json");
        IConfiguration configuration = new ConfigurationBuilder().AddJsonFile(path).Build();
        using ServiceProvider services = new ServiceCollection().AddLogging().AddModelWatchDaemon(configuration).BuildServiceProvider();

        DaemonOptions daemon = services.GetRequiredService<IOptions<DaemonOptions>>().Value;
        NotificationOptions notifications = services.GetRequiredService<IOptions<NotificationOptions>>().Value;

        Assert.Equal(2, daemon.Concurrency);
        Assert.Equal(TimeSpan.FromMinutes(10), daemon.LeaseDuration);
        Assert.Equal("critical", notifications.Targets["courier-oncall"].MinimumSeverity);
        Assert.Equal(TimeSpan.FromDays(180), services.GetRequiredService<IOptions<RetentionOptions>>().Value.RunMaxAge);
        Assert.False(services.GetRequiredService<IOptions<HttpOptions>>().Value.Enabled);
        Assert.Empty(DaemonSettings.Audit(configuration).Problems);
        Assert.Empty(DaemonSettings.Audit(configuration).Warnings);
    }

    [Fact]
    public void Every_sample_spec_names_sources_and_targets_the_sample_settings_define()
    {
        string root = RepositoryRoot();
        IConfiguration configuration = new ConfigurationBuilder().AddJsonFile(Path.Combine(root, "sample-config", "appsettings.json")).Build();
        using ServiceProvider services = new ServiceCollection().AddLogging().AddModelWatchDaemon(configuration).BuildServiceProvider();
        NotificationOptions notifications = services.GetRequiredService<IOptions<NotificationOptions>>().Value;

        foreach ((ModelSpec spec, string file) in ModelSpecFiles.Load(Path.Combine(root, "sample-config", "models")))
        {
            Assert.All(spec.Notify, target => Assert.True(notifications.Targets.ContainsKey(target), $"{file}: notify names {target}, which appsettings.json does not define"));
            Assert.True(spec.Source is null || configuration[$"Sources:{spec.Source}:ConnectionString"] is not null, $"{file}: source {spec.Source} is not in appsettings.json");
            Assert.NotNull(SpecThresholds.For(spec, DateTimeOffset.UnixEpoch));
        }
    }

    [Fact]
    public void Invalid_settings_are_reported_all_at_once()
    {
        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["ConnectionStrings:State"] = "Host=localhost",
            ["Daemon:Concurrency"] = "0",
            ["Notifications:Targets:pager:Url"] = "not a url",
            ["Notifications:Targets:pager:Secret"] = "short",
        }).Build();
        using ServiceProvider services = new ServiceCollection().AddLogging().AddModelWatchDaemon(configuration).BuildServiceProvider();

        var daemon = Assert.Throws<OptionsValidationException>(() => services.GetRequiredService<IOptions<DaemonOptions>>().Value);
        var targets = Assert.Throws<OptionsValidationException>(() => services.GetRequiredService<IOptions<NotificationOptions>>().Value);

        Assert.Contains(daemon.Failures, f => f.Contains("Concurrency", StringComparison.Ordinal));
        Assert.Contains(targets.Failures, f => f.Contains("Notifications:Targets:pager", StringComparison.Ordinal) && f.Contains("Url", StringComparison.Ordinal));
        Assert.Contains(targets.Failures, f => f.Contains("Secret", StringComparison.Ordinal));
    }

    private static string RepositoryRoot()
    {
        string? folder = AppContext.BaseDirectory;
        while (folder is not null && !File.Exists(Path.Combine(folder, "ModelWatch.sln")))
        {
            folder = Path.GetDirectoryName(folder);
        }

        return folder ?? throw new InvalidOperationException("ModelWatch.sln not found above " + AppContext.BaseDirectory);
    }
}
