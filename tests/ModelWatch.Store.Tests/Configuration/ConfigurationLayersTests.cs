using System.Collections;
using Microsoft.Extensions.Configuration;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Store.Tests.Configuration;

/// <summary>
/// The precedence the daemon and every command share, one step at a time: built-in defaults &lt; appsettings.json in
/// the working folder &lt; appsettings.{Environment}.json &lt; the MODELWATCH_SETTINGS file &lt; environment variables &lt;
/// command-line options. The environment is passed in, so tests running in parallel do not share it.
/// </summary>
public sealed class ConfigurationLayersTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("mw-layers-").FullName;

    public ConfigurationLayersTests()
    {
        File.WriteAllText(Path.Combine(_folder, "appsettings.json"), """{ "Daemon": { "Concurrency": 2, "PollInterval": "00:00:20", "WorkerId": "from-appsettings" } }""");
        File.WriteAllText(Path.Combine(_folder, "appsettings.Staging.json"), """{ "Daemon": { "Concurrency": 3, "WorkerId": "from-environment-file" } }""");
        File.WriteAllText(Path.Combine(_folder, "extra.json"), """{ "Daemon": { "Concurrency": 4 } }""");
    }

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public void Without_any_file_nothing_is_set_and_the_options_defaults_apply()
    {
        string empty = Directory.CreateTempSubdirectory("mw-layers-empty-").FullName;
        try
        {
            IConfiguration configuration = ConfigurationLayers.Load(empty, environment: new Hashtable());
            Assert.Null(configuration["Daemon:Concurrency"]);
        }
        finally
        {
            Directory.Delete(empty);
        }
    }

    [Fact]
    public void Appsettings_json_in_the_working_folder_is_read()
    {
        IConfiguration configuration = ConfigurationLayers.Load(_folder, environment: new Hashtable());
        Assert.Equal("2", configuration["Daemon:Concurrency"]);
        Assert.Equal("00:00:20", configuration["Daemon:PollInterval"]);
    }

    [Fact]
    public void The_environment_file_overrides_appsettings_json_key_by_key()
    {
        IConfiguration configuration = ConfigurationLayers.Load(_folder, environment: new Hashtable { ["DOTNET_ENVIRONMENT"] = "Staging" });
        Assert.Equal("3", configuration["Daemon:Concurrency"]);
        Assert.Equal("00:00:20", configuration["Daemon:PollInterval"]);
        Assert.Equal("Staging", ConfigurationLayers.EnvironmentName(new Hashtable { ["ASPNETCORE_ENVIRONMENT"] = "Staging" }));
        Assert.Equal("Production", ConfigurationLayers.EnvironmentName(new Hashtable()));
    }

    [Fact]
    public void The_modelwatch_settings_file_overrides_the_environment_file()
    {
        IConfiguration configuration = ConfigurationLayers.Load(_folder, environment: new Hashtable { ["DOTNET_ENVIRONMENT"] = "Staging", ["MODELWATCH_SETTINGS"] = "extra.json" });
        Assert.Equal("4", configuration["Daemon:Concurrency"]);
        Assert.Equal("from-environment-file", configuration["Daemon:WorkerId"]);
    }

    [Fact]
    public void Environment_variables_override_every_file()
    {
        IConfiguration configuration = ConfigurationLayers.Load(_folder, environment: new Hashtable
        {
            ["DOTNET_ENVIRONMENT"] = "Staging",
            ["MODELWATCH_SETTINGS"] = "extra.json",
            ["Daemon__Concurrency"] = "5",
        });
        Assert.Equal("5", configuration["Daemon:Concurrency"]);
    }

    [Fact]
    public void Command_line_options_override_environment_variables()
    {
        IConfiguration configuration = ConfigurationLayers.Load(
            _folder,
            commandLine: [new(ConnectionSettings.StateKey, "Host=from-option")],
            environment: new Hashtable { ["ConnectionStrings__State"] = "Host=from-environment", ["Daemon__Concurrency"] = "5" });
        Assert.Equal("Host=from-option", configuration[ConnectionSettings.StateKey]);
        Assert.Equal("5", configuration["Daemon:Concurrency"]);
    }

    [Fact]
    public void A_settings_file_that_is_missing_or_not_json_is_a_clear_error()
    {
        var missing = Assert.Throws<StoreConfigurationException>(() => ConfigurationLayers.Load(_folder, environment: new Hashtable { ["MODELWATCH_SETTINGS"] = "nowhere.json" }));
        Assert.Contains("MODELWATCH_SETTINGS names", missing.Message, StringComparison.Ordinal);
        Assert.Contains("nowhere.json, which does not exist", missing.Message, StringComparison.Ordinal);

        File.WriteAllText(Path.Combine(_folder, "broken.json"), "{ \"Daemon\": ");
        var broken = Assert.Throws<StoreConfigurationException>(() => ConfigurationLayers.Load(_folder, environment: new Hashtable { ["MODELWATCH_SETTINGS"] = "broken.json" }));
        Assert.Contains("broken.json", broken.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Keys_nothing_reads_are_found_by_name_into_nested_sections_and_dictionaries()
    {
        IConfiguration configuration = new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            ["Sources:shop:ConnectionString"] = "Host=shop",
            ["Sources:shop:ConectionString"] = "Host=typo",
            ["Other:Anything"] = "not audited",
        }).Build();

        Assert.Equal(["Sources:shop:ConectionString"], UnknownSettings.Find(configuration, ConnectionSettings.AuditedSections));
    }
}
