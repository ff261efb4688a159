using System.CommandLine;
using System.CommandLine.Parsing;
using ModelWatch.Cli.Commands;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// Options of <c>check</c> and <c>backtest</c> that parse while the command line is parsed, so a bad time or duration
/// is a usage error (exit code 2) that names the option, before any database is opened.
/// </summary>
internal static class OperationOptions
{
    public static Option<DateTimeOffset?> Time(string name, string description, bool required) => new(name)
    {
        Description = description + " (RFC 3339 with Z or an offset, e.g. 2026-03-01T00:00:00Z; a date alone is midnight UTC; now, -7d, +2h)",
        Required = required,
        CustomParser = result => ParseTime(name, result),
    };

    public static Option<Duration?> Every() => new("--every")
    {
        Description = "Time between backtest slots: an integer and a unit s, m, h, d or w (default: the spec's schedule)",
        CustomParser = result =>
        {
            string text = result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
            if (Duration.TryParse(text, out Duration duration, out string error) && duration.Amount > 0)
            {
                return duration;
            }

            result.AddError($"--every: {(error.Length > 0 ? error : $"'{text}' is not a positive duration")}");
            return null;
        },
    };

    public static Option<OutputFormat> Format() => new("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };

    /// <summary>The time an option was given, or null when it is absent or does not parse.</summary>
    public static DateTimeOffset? TryTime(OptionResult? result) =>
        result is { Tokens.Count: > 0 } && StrictTime.TryParse(result.Tokens[0].Value, TimeProvider.System.GetUtcNow(), out DateTimeOffset value, out _) ? value : null;

    private static DateTimeOffset? ParseTime(string name, ArgumentResult result)
    {
        string text = result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;
        if (StrictTime.TryParse(text, TimeProvider.System.GetUtcNow(), out DateTimeOffset value, out string error))
        {
            return value;
        }

        result.AddError($"{name}: {error}");
        return null;
    }
}
