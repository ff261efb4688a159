using System.Globalization;

namespace ModelWatch.Cli.Output;

/// <summary>
/// How many columns a table may use. <c>COLUMNS</c> (a positive number) wins, as it does for other command-line tools;
/// otherwise the terminal's width when the command writes to the process's own terminal; otherwise (a pipe, a file, a
/// test's writer) no limit, so that scripts and saved output keep every character of every cell.
/// </summary>
internal static class TerminalWidth
{
    /// <summary>The environment variable that sets the width whatever the output is.</summary>
    public const string Variable = "COLUMNS";

    /// <summary>Used when the output is a terminal that does not report its width.</summary>
    public const int Fallback = 80;

    /// <summary>The width for <paramref name="output"/>, or null for no limit.</summary>
    public static int? For(TextWriter output)
    {
        if (int.TryParse(Environment.GetEnvironmentVariable(Variable), NumberStyles.None, CultureInfo.InvariantCulture, out int columns) && columns > 0)
        {
            return columns;
        }

        if (!ReferenceEquals(output, Console.Out) || Console.IsOutputRedirected)
        {
            return null;
        }

        try
        {
            return Console.WindowWidth > 0 ? Console.WindowWidth : Fallback;
        }
        catch (IOException)
        {
            return Fallback;
        }
    }
}
