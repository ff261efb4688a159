using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Numerics;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// Gives every typed option and argument of the command tree a parser that reports a bad value in the user's words
/// ("--format: 'yaml' is not one of table, json", "'abc' is not an alert id (a whole number)"). Without it the
/// command-line library names .NET types ("expected type 'System.Int64'"). Options that already parse themselves
/// (times, durations) are left as they are.
/// </summary>
internal static class ValueParsers
{
    /// <summary>The names <c>--format</c> accepts, in the order help lists them.</summary>
    public static readonly IReadOnlyList<string> FormatNames = ["table", "json"];

    /// <summary>Attaches the parsers to <paramref name="command"/> and every command below it.</summary>
    public static void Apply(Command command)
    {
        ArgumentNullException.ThrowIfNull(command);
        foreach (Option option in command.Options)
        {
            Attach(option);
        }

        foreach (Argument argument in command.Arguments)
        {
            Attach(argument);
        }

        foreach (Command subcommand in command.Subcommands)
        {
            Apply(subcommand);
        }
    }

    private static void Attach(Symbol symbol)
    {
        switch (symbol)
        {
            case Option<OutputFormat> { CustomParser: null } format:
                format.HelpName = string.Join('|', FormatNames);
                format.CustomParser = result => Format(result, format.Name);
                break;
            case Option<int> { CustomParser: null } option:
                option.CustomParser = result => Whole<int>(result, option.Name + ": ", "a whole number");
                break;
            case Option<long> { CustomParser: null } option:
                option.CustomParser = result => Whole<long>(result, option.Name + ": ", "a whole number");
                break;
            case Option<long?> { CustomParser: null } option:
                option.CustomParser = result => result.Tokens.Count == 0 ? null : Whole<long>(result, option.Name + ": ", "a whole number");
                break;
            case Option<int?> { CustomParser: null } option:
                option.CustomParser = result => result.Tokens.Count == 0 ? null : Whole<int>(result, option.Name + ": ", "a whole number");
                break;
            case Option<double> { CustomParser: null } option:
                option.CustomParser = result => Real(result, option.Name + ": ");
                break;
            case Argument<int> { CustomParser: null } argument:
                argument.CustomParser = result => Whole<int>(result, string.Empty, Noun(argument) + " (a whole number)");
                break;
            case Argument<long> { CustomParser: null } argument:
                argument.CustomParser = result => Whole<long>(result, string.Empty, Noun(argument) + " (a whole number)");
                break;
            case Argument<long?> { CustomParser: null } argument:
                argument.CustomParser = result => result.Tokens.Count == 0 ? null : Whole<long>(result, string.Empty, Noun(argument) + " (a whole number)");
                break;
            default:
                break;
        }
    }

    private static OutputFormat Format(ArgumentResult result, string name)
    {
        string text = Text(result);
        int index = FormatNames.Select(n => n.ToUpperInvariant()).ToList().IndexOf(text.ToUpperInvariant());
        if (index >= 0)
        {
            return (OutputFormat)index;
        }

        result.AddError($"{name}: '{text}' is not one of {string.Join(", ", FormatNames)}");
        return OutputFormat.Table;
    }

    private static T Whole<T>(ArgumentResult result, string prefix, string what)
        where T : struct, IBinaryInteger<T>, IMinMaxValue<T>
    {
        string text = Text(result);
        if (T.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out T value))
        {
            return value;
        }

        bool digits = text.TrimStart('-', '+').Length > 0 && text.TrimStart('-', '+').All(char.IsAsciiDigit);
        result.AddError(digits
            ? string.Create(CultureInfo.InvariantCulture, $"{prefix}'{text}' is out of range ({T.MinValue} to {T.MaxValue})")
            : $"{prefix}'{text}' is not {what}");
        return default;
    }

    private static double Real(ArgumentResult result, string prefix)
    {
        string text = Text(result);
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double value) && double.IsFinite(value))
        {
            return value;
        }

        result.AddError($"{prefix}'{text}' is not a number");
        return default;
    }

    private static string Text(ArgumentResult result) => result.Tokens.Count > 0 ? result.Tokens[0].Value : string.Empty;

    // "Alert id (or --since ...)" reads "an alert id"; "An alert id or a run id" stays as written.
    private static string Noun(Argument argument)
    {
        string text = argument.Description is { Length: > 0 } d ? d : argument.Name;
        int aside = text.IndexOf(" (", StringComparison.Ordinal);
        text = aside > 0 ? text[..aside] : text;
        text = char.ToLowerInvariant(text[0]) + text[1..];
        return text.StartsWith("a ", StringComparison.Ordinal) || text.StartsWith("an ", StringComparison.Ordinal) || text.StartsWith("the ", StringComparison.Ordinal)
            ? text
            : ("aeiou".Contains(text[0], StringComparison.Ordinal) ? "an " : "a ") + text;
    }
}
