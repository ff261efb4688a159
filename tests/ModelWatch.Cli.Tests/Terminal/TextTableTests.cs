using System.Text.RegularExpressions;
using ModelWatch.Cli.Output;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>The one table layout: fits a width, never splits a word, shortens only the free-text column.</summary>
public sealed partial class TextTableTests
{
    private const string Explanation =
        "the coefficient of traffic_index has moved: 0.464 on the window's 600 rows against 0.355 deployed; the moving-estimates monitor at 5.93 crossed its boundary";

    private static readonly string[][] Runs =
    [
        ["ID", "MODEL", "SLOT", "WINDOW", "STATUS", "EXPLANATION"],
        ["117", "courier-eta", "2026-04-07T00:00:00Z", "2026-04-06T00:00:00Z → 2026-04-07T00:00:00Z", "critical", Explanation],
        ["116", "courier-eta", "2026-04-06T18:00:00Z", "2026-04-05T18:00:00Z → 2026-04-06T18:00:00Z", "ok", "short"],
    ];

    [Theory]
    [InlineData(80)]
    [InlineData(100)]
    public void At_80_and_100_columns_every_line_fits_and_every_time_is_whole(int width)
    {
        string[] lines = Lines(Runs, width, freeTextColumn: 5);

        Assert.All(lines, l => Assert.True(l.Length <= width, $"{l.Length} > {width}: {l}"));
        string text = string.Join('\n', lines);
        // Six times went in; each comes out whole, and no piece of one is left over on another line.
        Assert.Equal(6, Time().Count(text));
        Assert.Equal(6, Regex.Count(text, "20[0-9][0-9]-"));
        Assert.DoesNotContain(lines, l => l.TrimStart().StartsWith('→'));
    }

    [Theory]
    [InlineData(80)]
    [InlineData(100)]
    public void Long_free_text_is_shortened_on_one_line_with_an_ellipsis(int width)
    {
        string[] lines = Lines(Runs, width, freeTextColumn: 5);

        string shortened = Assert.Single(lines, l => l.Contains("the coefficient", StringComparison.Ordinal));
        Assert.EndsWith(TextTable.Ellipsis, shortened, StringComparison.Ordinal);
        string shown = shortened[shortened.IndexOf("the coefficient", StringComparison.Ordinal)..^1];
        Assert.StartsWith(shown.TrimEnd(), Explanation, StringComparison.Ordinal);
        Assert.DoesNotContain(lines, l => l.Contains("crossed its boundary", StringComparison.Ordinal));
    }

    [Fact]
    public void Free_text_with_room_stays_beside_its_row()
    {
        string[] lines = Lines(Runs, 140, freeTextColumn: 5);

        Assert.Equal(3, lines.Length);
        Assert.StartsWith("117", lines[1], StringComparison.Ordinal);
        Assert.Contains("the coefficient", lines[1], StringComparison.Ordinal);
    }

    [Fact]
    public void Free_text_without_room_moves_under_its_row()
    {
        string[] lines = Lines(Runs, 80, freeTextColumn: 5);

        Assert.Equal("    EXPLANATION", lines[1]);
        int row = Array.FindIndex(lines, l => l.StartsWith("117", StringComparison.Ordinal));
        int next = Array.FindIndex(lines, l => l.StartsWith("116", StringComparison.Ordinal));
        int text = Array.FindIndex(lines, l => l.StartsWith("    the coefficient", StringComparison.Ordinal));
        Assert.InRange(text, row + 1, next - 1);
        Assert.InRange(lines[text].Length, 70, 80);
    }

    [Fact]
    public void Without_a_width_nothing_is_shortened_or_wrapped()
    {
        string[] lines = Lines(Runs, width: null, freeTextColumn: 5);

        Assert.Equal(3, lines.Length);
        Assert.Contains(Explanation, lines[1], StringComparison.Ordinal);
        Assert.Contains("2026-04-06T00:00:00Z → 2026-04-07T00:00:00Z", lines[1], StringComparison.Ordinal);
    }

    [Fact]
    public void A_table_too_wide_for_its_width_runs_past_it_rather_than_split_a_word()
    {
        string[] lines = Lines([["A", "B"], ["2026-04-07T00:00:00Z", "2026-04-08T00:00:00Z"]], width: 30, freeTextColumn: null);

        Assert.Equal(["A                     B", "2026-04-07T00:00:00Z  2026-04-08T00:00:00Z"], lines);
    }

    [Fact]
    public void Shortening_keeps_a_surrogate_pair_whole()
    {
        Assert.Equal("ab…", TextTable.Shorten("ab\U0001F600cd", 4));
        Assert.Equal("abcd", TextTable.Shorten("abcd", 4));
    }

    private static string[] Lines(IReadOnlyList<string[]> rows, int? width, int? freeTextColumn) =>
        [.. TextTable.Layout(rows, width, freeTextColumn).Select(l => string.Join(new string(' ', TextTable.Gap), l).TrimEnd())];

    [GeneratedRegex(@"\b20[0-9]{2}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}Z")]
    private static partial Regex Time();
}
