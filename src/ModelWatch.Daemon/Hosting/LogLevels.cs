using Microsoft.Extensions.Configuration;
using Serilog;
using Serilog.Events;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Log levels from the standard <c>Logging:LogLevel</c> section: <c>Default</c> sets the minimum, any other key a
/// category prefix (<c>Logging:LogLevel:Npgsql = Debug</c>). Without it: Information, and Warning for the framework,
/// HTTP and Npgsql categories, which are noisy at Information.
/// </summary>
public static class LogLevels
{
    private static readonly Dictionary<string, LogEventLevel> Defaults = new(StringComparer.Ordinal)
    {
        ["Default"] = LogEventLevel.Information,
        ["Microsoft"] = LogEventLevel.Warning,
        ["System.Net.Http"] = LogEventLevel.Warning,
        ["Npgsql"] = LogEventLevel.Warning,
    };

    /// <summary>Sets the minimum level and overrides on <paramref name="logger"/>.</summary>
    /// <exception cref="FormatException">A level is not one of Trace, Debug, Information, Warning, Error, Critical, None.</exception>
    public static void Apply(LoggerConfiguration logger, IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(logger);
        ArgumentNullException.ThrowIfNull(configuration);
        var levels = new Dictionary<string, LogEventLevel>(Defaults, StringComparer.Ordinal);
        foreach (IConfigurationSection entry in configuration.GetSection("Logging:LogLevel").GetChildren())
        {
            levels[entry.Key] = Parse(entry.Path, entry.Value);
        }

        logger.MinimumLevel.Is(levels["Default"]);
        foreach ((string category, LogEventLevel level) in levels.Where(l => l.Key != "Default"))
        {
            logger.MinimumLevel.Override(category, level);
        }
    }

    /// <summary>Every problem with the configured levels (for the configuration audit).</summary>
    public static IEnumerable<string> Problems(IConfiguration configuration)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        foreach (IConfigurationSection entry in configuration.GetSection("Logging:LogLevel").GetChildren())
        {
            string? problem = null;
            try
            {
                Parse(entry.Path, entry.Value);
            }
            catch (FormatException ex)
            {
                problem = ex.Message;
            }

            if (problem is not null)
            {
                yield return problem;
            }
        }
    }

    private static LogEventLevel Parse(string key, string? value) => value?.Trim() switch
    {
        "Trace" => LogEventLevel.Verbose,
        "Debug" => LogEventLevel.Debug,
        "Information" => LogEventLevel.Information,
        "Warning" => LogEventLevel.Warning,
        "Error" => LogEventLevel.Error,
        "Critical" or "None" => LogEventLevel.Fatal,
        _ => throw new FormatException($"{key}: '{value}' is not a log level (Trace, Debug, Information, Warning, Error, Critical, None)"),
    };
}
