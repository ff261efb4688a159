using System.Text;
using ModelWatch.Cli.Operations;
using Spectre.Console;

namespace ModelWatch.Cli.Output;

/// <summary>
/// The one table writer of the command line. A table is laid out within <see cref="TerminalWidth"/> without ever
/// splitting a word: a time, an id or a key is whole on one line. To fit, it first shortens the free-text column
/// (an explanation or a reason, cut with an ellipsis: the whole text is in <c>--format json</c> and <c>explain</c>)
/// and lets cells of several words continue on a second line at a space; when the free text would keep fewer than
/// 30 characters it moves to an indented line of its own under its row; when the other columns alone are too wide,
/// the line runs past the width rather than split a word. Severity words are coloured when a person is watching the terminal.
/// </summary>
internal static class TextTable
{
    /// <summary>Spaces between columns.</summary>
    public const int Gap = 2;

    /// <summary>The mark at the end of shortened free text.</summary>
    public const string Ellipsis = "…";

    // Free text keeps at least this much beside the other columns (which wrap at spaces to make room); with less
    // it moves to a line of its own under its row.
    private const int FreeTextComfort = 30;

    // Below this a shortened text says nothing.
    private const int FreeTextMinimum = 8;

    // Free text that has a line of its own starts here.
    private const string Indent = "    ";

    /// <summary>
    /// Prints <paramref name="rows"/> (the first is the header) to <paramref name="output"/>.
    /// <paramref name="freeText"/> is the header of the column whose long text may be shortened, if any.
    /// </summary>
    public static void Write(TextWriter output, IReadOnlyList<string[]> rows, string? freeText = null)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(rows);
        int column = freeText is null ? -1 : Array.IndexOf(rows[0], freeText);
        IReadOnlyList<string[]> lines = Layout(rows, TerminalWidth.For(output), column >= 0 ? column : null);
        if (!Terminal.IsTerminal(output))
        {
            foreach (string[] line in lines)
            {
                output.WriteLine(Join(line));
            }

            return;
        }

        IAnsiConsole console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Out) });
        // The lines are already laid out; Spectre must not wrap them again.
        console.Profile.Width = Math.Max(1, lines.Max(l => Join(l).Length));
        foreach (string[] line in lines)
        {
            console.MarkupLine(string.Concat(line.Select((fragment, c) => (c == 0 ? string.Empty : new string(' ', Gap)) + Colour(fragment))).TrimEnd());
        }
    }

    /// <summary>
    /// The printed lines of a table: one array of padded fragments per line (a row can take more than one line).
    /// <paramref name="width"/> null means no limit.
    /// </summary>
    public static IReadOnlyList<string[]> Layout(IReadOnlyList<string[]> rows, int? width, int? freeTextColumn)
    {
        ArgumentNullException.ThrowIfNull(rows);
        string[][] cells = [.. rows.Select(r => r.Select(c => TerminalText.Clean(c) ?? string.Empty).ToArray())];
        int columns = cells[0].Length;
        int[] natural = [.. Enumerable.Range(0, columns).Select(c => cells.Max(r => r[c].Length))];
        int[] shortest = [.. Enumerable.Range(0, columns).Select(c => cells.Max(r => LongestWord(r[c])))];
        int[] grid = [.. Enumerable.Range(0, columns)];
        int? beneath = null;
        int[] widths = [.. natural];
        if (width is { } limit && freeTextColumn is { } free)
        {
            int[] others = [.. grid.Where(c => c != free)];
            int wanted = Math.Min(natural[free], FreeTextComfort);
            widths = Fit(natural, shortest, others, limit - wanted - Gap);
            int left = limit - others.Sum(c => widths[c] + Gap);
            if (left >= wanted)
            {
                widths[free] = Math.Min(natural[free], left);
            }
            else
            {
                // Too narrow for the text beside the other columns: it goes on a line of its own under its row.
                grid = others;
                beneath = free;
                widths = Fit(natural, shortest, others, limit);
            }
        }
        else if (width is { } plain)
        {
            widths = Fit(natural, shortest, grid, plain);
        }

        var lines = new List<string[]>();
        foreach (string[] row in cells)
        {
            List<string>[] parts = [.. grid.Select(c => c == freeTextColumn ? [Shorten(row[c], widths[c])] : Wrap(row[c], widths[c]))];
            int height = parts.Max(p => p.Count);
            for (int i = 0; i < height; i++)
            {
                lines.Add([.. grid.Select((c, g) => (i < parts[g].Count ? parts[g][i] : string.Empty).PadRight(g == grid.Length - 1 ? 0 : widths[c]))]);
            }

            if (beneath is { } text && row[text].Length > 0)
            {
                lines.Add([Indent + Shorten(row[text], Math.Max(FreeTextMinimum, width!.Value - Indent.Length))]);
            }
        }

        return lines;
    }

    /// <summary>The text cut to <paramref name="width"/> characters, the last being an ellipsis when anything was cut.</summary>
    public static string Shorten(string text, int width)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (text.Length <= width)
        {
            return text;
        }

        int keep = Math.Max(0, width - Ellipsis.Length);
        if (keep > 0 && char.IsHighSurrogate(text[keep - 1]))
        {
            keep--;
        }

        return text[..keep].TrimEnd() + Ellipsis;
    }

    // Natural widths, with the given columns wrapped (widest saving first, never below their longest word) until
    // they and their gaps take at most `budget` characters, or cannot shrink further.
    private static int[] Fit(int[] natural, int[] shortest, int[] columns, int budget)
    {
        int[] widths = [.. natural];
        int excess = columns.Sum(c => natural[c] + Gap) - Gap - budget;
        foreach (int c in columns.OrderByDescending(c => natural[c] - shortest[c]))
        {
            int take = Math.Clamp(Math.Min(excess, widths[c] - shortest[c]), 0, int.MaxValue);
            widths[c] -= take;
            excess -= take;
        }

        return widths;
    }

    private static int LongestWord(string text) => text.Length == 0 ? 0 : Words(text).Max(w => w.Length);

    // The pieces a cell may be wrapped between: words, with a lone sign (an arrow, a dash) kept on the word before it
    // so that no line starts with "→".
    private static List<string> Words(string text)
    {
        var words = new List<string>();
        foreach (string word in text.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            if (words.Count > 0 && !word.Any(char.IsLetterOrDigit))
            {
                words[^1] += " " + word;
            }
            else
            {
                words.Add(word);
            }
        }

        return words;
    }

    private static List<string> Wrap(string text, int width)
    {
        if (text.Length <= width)
        {
            return [text];
        }

        var lines = new List<string>();
        var line = new StringBuilder();
        foreach (string word in Words(text))
        {
            if (line.Length > 0 && line.Length + 1 + word.Length > width)
            {
                lines.Add(line.ToString());
                line.Clear();
            }

            line.Append(line.Length > 0 ? " " : string.Empty).Append(word);
        }

        lines.Add(line.ToString());
        return lines;
    }

    private static string Join(string[] line) => string.Join(new string(' ', Gap), line).TrimEnd();

    private static string Colour(string fragment)
    {
        string word = fragment.TrimEnd();
        string padding = fragment[word.Length..];
        return word switch
        {
            "critical" => "[red]critical[/]",
            "warning" => "[yellow]warning[/]",
            "ok" => "[green]ok[/]",
            _ => Markup.Escape(word),
        } + padding;
    }
}
