using System.Collections;
using Microsoft.Extensions.Configuration;

namespace ModelWatch.Store.Configuration;

/// <summary>
/// The one configuration path of the daemon and of every command, lowest precedence first: built-in defaults (the
/// options classes), <c>appsettings.json</c> in the working folder, <c>appsettings.{Environment}.json</c> there, the
/// file named by <c>MODELWATCH_SETTINGS</c>, environment variables, and command-line options. A later layer wins key
/// by key.
/// </summary>
public static class ConfigurationLayers
{
    /// <summary>The environment variable that names an extra settings file.</summary>
    public const string SettingsFileVariable = "MODELWATCH_SETTINGS";

    /// <summary>
    /// The environment name (<c>DOTNET_ENVIRONMENT</c>, else <c>ASPNETCORE_ENVIRONMENT</c>, else <c>Production</c>), which
    /// picks <c>appsettings.{Environment}.json</c>.
    /// </summary>
    public static string EnvironmentName(IDictionary? environment = null)
    {
        environment ??= Environment.GetEnvironmentVariables();
        foreach (string variable in (string[])["DOTNET_ENVIRONMENT", "ASPNETCORE_ENVIRONMENT"])
        {
            if (environment[variable] is string { Length: > 0 } name)
            {
                return name;
            }
        }

        return "Production";
    }

    /// <summary>Adds the layers, in order, to <paramref name="builder"/>.</summary>
    /// <param name="builder">The builder (its existing sources stay below these).</param>
    /// <param name="directory">The working folder the appsettings files are read from.</param>
    /// <param name="environmentName">Picks <c>appsettings.{Environment}.json</c>.</param>
    /// <param name="commandLine">Settings given as command-line options (keys in <c>Section:Key</c> form), or null.</param>
    /// <param name="environment">The environment variables (default: the process's); <c>__</c> in a name separates sections.</param>
    public static IConfigurationBuilder AddModelWatchLayers(this IConfigurationBuilder builder, string directory, string environmentName, IEnumerable<KeyValuePair<string, string?>>? commandLine = null, IDictionary? environment = null)
    {
        ArgumentNullException.ThrowIfNull(builder);
        string folder = Path.GetFullPath(directory);
        builder.AddJsonFile(Path.Combine(folder, "appsettings.json"), optional: true, reloadOnChange: false);
        builder.AddJsonFile(Path.Combine(folder, $"appsettings.{environmentName}.json"), optional: true, reloadOnChange: false);
        string? settingsFile = environment is null ? Environment.GetEnvironmentVariable(SettingsFileVariable) : environment[SettingsFileVariable] as string;
        if (settingsFile is { Length: > 0 } file)
        {
            string path = Path.GetFullPath(file, folder);
            if (!File.Exists(path))
            {
                throw new StoreConfigurationException($"{SettingsFileVariable} names {path}, which does not exist");
            }

            builder.AddJsonFile(path, optional: false, reloadOnChange: false);
        }

        if (environment is null)
        {
            builder.AddEnvironmentVariables();
        }
        else
        {
            // The same mapping as the environment-variable provider: FOO__BAR is FOO:BAR.
            builder.AddInMemoryCollection(environment.Cast<DictionaryEntry>()
                .Select(e => new KeyValuePair<string, string?>(((string)e.Key).Replace("__", ConfigurationPath.KeyDelimiter, StringComparison.Ordinal), e.Value as string)));
        }

        if (commandLine is not null)
        {
            builder.AddInMemoryCollection(commandLine);
        }

        return builder;
    }

    /// <summary>Builds the layered configuration for a command run in <paramref name="directory"/> (default: the working folder).</summary>
    public static IConfigurationRoot Load(string? directory = null, IEnumerable<KeyValuePair<string, string?>>? commandLine = null, IDictionary? environment = null)
    {
        var builder = new ConfigurationBuilder().AddModelWatchLayers(directory ?? Directory.GetCurrentDirectory(), EnvironmentName(environment), commandLine, environment);
        try
        {
            return builder.Build();
        }
        catch (InvalidDataException ex)
        {
            // A settings file that is not JSON: the parser's message names the file and the position.
            throw new StoreConfigurationException($"settings: {ex.Message} {ex.InnerException?.Message}".TrimEnd());
        }
    }
}
