using System.Text;
using ModelWatch.Cli.Operations;
using Spectre.Console;

namespace ModelWatch.Cli.Output;

/// <summary>
/// The one table writer of the command line. A table is laid out within <see cref="TerminalWidth"/> without ever
/// splitting a word: a time, an id or a key is whole on one line. To fit, it first shortens the free-text column
/// (an explanation or a reason, cut with an ellipsis: the whole text is in <c>--format json</c> and <c>explain</c>),
/// then lets cells of several words continue on a second line at a space, and only when even that is not enough
/// lets the line run past the width. Severity words are coloured when a person is watching the terminal.
/// </summary>
internal static class TextTable
{
    /// <summary>Spaces between columns.</summary>
    public const int Gap = 2;

    /// <summary>The mark at the end of shortened free text.</summary>
    public const string Ellipsis = "…";

    // Free text is shortened to this first, before any other column wraps: a sentence's start is worth more than
    // keeping a time range on one line.
    private const int FreeTextComfort = 30;

    // Below this a shortened text says nothing.
    private const int FreeTextMinimum = 8;

    /// <summary>
    /// Prints <paramref name="rows"/> (the first is the header) to <paramref name="output"/>.
    /// <paramref name="freeTextColumn"/> is the index of the column whose long text may be shortened, if any.
    /// </summary>
    public static void Write(TextWriter output, IReadOnlyList<string[]> rows, int? freeTextColumn = null)
    {
        ArgumentNullException.ThrowIfNull(output);
        IReadOnlyList<string[]> lines = Layout(rows, TerminalWidth.For(output), freeTextColumn);
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
        int[] widths = ColumnWidths(cells, width, freeTextColumn);
        var lines = new List<string[]>();
        foreach (string[] row in cells)
        {
            List<string>[] parts = [.. Enumerable.Range(0, columns).Select(c => c == freeTextColumn ? [Shorten(row[c], widths[c])] : Wrap(row[c], widths[c]))];
            int height = parts.Max(p => p.Count);
            for (int i = 0; i < height; i++)
            {
                lines.Add([.. Enumerable.Range(0, columns).Select(c => (i < parts[c].Count ? parts[c][i] : string.Empty).PadRight(c == columns - 1 ? 0 : widths[c]))]);
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

    private static int[] ColumnWidths(string[][] cells, int? width, int? freeTextColumn)
    {
        int columns = cells[0].Length;
        int[] natural = [.. Enumerable.Range(0, columns).Select(c => cells.Max(r => r[c].Length))];
        int[] widths = [.. natural];
        if (width is not { } limit)
        {
            return widths;
        }

        int excess = widths.Sum() + (Gap * (columns - 1)) - limit;
        int[] shortest = [.. Enumerable.Range(0, columns).Select(c => c == freeTextColumn
            ? Math.Min(natural[c], Math.Max(FreeTextMinimum, cells[0][c].Length))
            : cells.Max(r => LongestWord(r[c])))];
        if (freeTextColumn is { } free)
        {
            excess -= Narrow(widths, free, Math.Max(shortest[free], Math.Min(natural[free], FreeTextComfort)), excess);
        }

        foreach (int c in Enumerable.Range(0, columns).Where(c => c != freeTextColumn).OrderByDescending(c => natural[c] - shortest[c]))
        {
            excess -= Narrow(widths, c, shortest[c], excess);
        }

        if (freeTextColumn is { } last)
        {
            Narrow(widths, last, shortest[last], excess);
        }

        return widths;
    }

    // Takes up to `excess` characters from a column without going below `floor`; returns how many it took.
    private static int Narrow(int[] widths, int column, int floor, int excess)
    {
        int take = Math.Clamp(Math.Min(excess, widths[column] - floor), 0, int.MaxValue);
        widths[column] -= take;
        return take;
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
