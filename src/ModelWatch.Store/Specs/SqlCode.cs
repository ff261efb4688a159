using System.Text;
using System.Text.RegularExpressions;

namespace ModelWatch.Store.Specs;

/// <summary>
/// The parts of a PostgreSQL statement that are code: comments (<c>--</c> to the end of the line, nested
/// <c>/* */</c>), string constants (<c>'…'</c>, <c>E'…'</c> with backslash escapes, dollar-quoted <c>$tag$…$tag$</c>) and
/// quoted identifiers (<c>"…"</c>) are blanked out, keeping every other character in place. A parameter or a
/// <c>;</c> that appears only inside them is not part of the statement: Npgsql binds parameters in code only, so a
/// window parameter written in a comment would leave the query unfiltered.
/// </summary>
public static partial class SqlCode
{
    /// <summary>The statement with comments, constants and quoted identifiers replaced by spaces.</summary>
    public static string Of(string sql)
    {
        ArgumentNullException.ThrowIfNull(sql);
        var code = new StringBuilder(sql);
        int i = 0;
        while (i < sql.Length)
        {
            char c = sql[i];
            int end = c switch
            {
                '-' when At(sql, i + 1, '-') => LineEnd(sql, i),
                '/' when At(sql, i + 1, '*') => BlockCommentEnd(sql, i),
                '\'' => QuotedEnd(sql, i, '\'', backslashEscapes: i > 0 && sql[i - 1] is 'E' or 'e' && (i < 2 || !IsIdentifier(sql[i - 2]))),
                '"' => QuotedEnd(sql, i, '"', backslashEscapes: false),
                '$' when DollarTag(sql, i) is { } tag => DollarEnd(sql, i, tag),
                _ => -1,
            };
            if (end < 0)
            {
                i++;
                continue;
            }

            for (int k = i; k < end; k++)
            {
                code[k] = sql[k] == '\n' ? '\n' : ' ';
            }

            i = end;
        }

        return code.ToString();
    }

    /// <summary>Whether <paramref name="parameter"/> (such as <c>@window_start</c>) is used in the statement's code.</summary>
    public static bool Uses(string sql, string parameter) =>
        Regex.IsMatch(Of(sql), "(?<![A-Za-z0-9_@])" + Regex.Escape(parameter) + "(?![A-Za-z0-9_])");

    private static bool At(string s, int i, char c) => i < s.Length && s[i] == c;

    private static bool IsIdentifier(char c) => char.IsLetterOrDigit(c) || c is '_' or '$';

    private static int LineEnd(string s, int i)
    {
        int newline = s.IndexOf('\n', i);
        return newline < 0 ? s.Length : newline;
    }

    private static int BlockCommentEnd(string s, int i)
    {
        int depth = 0;
        while (i < s.Length)
        {
            if (s[i] == '/' && At(s, i + 1, '*'))
            {
                depth++;
                i += 2;
            }
            else if (s[i] == '*' && At(s, i + 1, '/'))
            {
                depth--;
                i += 2;
                if (depth == 0)
                {
                    return i;
                }
            }
            else
            {
                i++;
            }
        }

        return s.Length;
    }

    private static int QuotedEnd(string s, int i, char quote, bool backslashEscapes)
    {
        i++;
        while (i < s.Length)
        {
            if (backslashEscapes && s[i] == '\\')
            {
                i += 2;
            }
            else if (s[i] == quote)
            {
                if (At(s, i + 1, quote))
                {
                    i += 2;
                }
                else
                {
                    return i + 1;
                }
            }
            else
            {
                i++;
            }
        }

        return s.Length;
    }

    private static string? DollarTag(string s, int i)
    {
        if (i > 0 && IsIdentifier(s[i - 1]))
        {
            return null;
        }

        Match match = DollarTagPattern().Match(s, i);
        return match.Success && match.Index == i ? match.Value : null;
    }

    private static int DollarEnd(string s, int i, string tag)
    {
        int close = s.IndexOf(tag, i + tag.Length, StringComparison.Ordinal);
        return close < 0 ? s.Length : close + tag.Length;
    }

    [GeneratedRegex(@"\$(?:[A-Za-z_\u0080-\uffff][A-Za-z0-9_\u0080-\uffff]*)?\$", RegexOptions.CultureInvariant)]
    private static partial Regex DollarTagPattern();
}
