using System.Globalization;
using System.Text;

namespace ModelWatch.Cli.Output;

/// <summary>
/// Makes text that came from users or data sources (notes, reasons, explanations, error messages) safe to print as
/// plain text: control characters — escape sequences that could recolour or rewrite a terminal, carriage returns and
/// line breaks that could forge lines — and the invisible bidirectional overrides are shown as <c>\xNN</c> or
/// <c>\uNNNN</c> instead of being sent. JSON output needs none of this: its writer escapes them itself.
/// </summary>
public static class TerminalText
{
    /// <summary>The text with every unsafe character written out; null stays null.</summary>
    public static string? Clean(string? text)
    {
        if (text is null || !text.Any(Unsafe))
        {
            return text;
        }

        var clean = new StringBuilder(text.Length + 8);
        foreach (char c in text)
        {
            if (!Unsafe(c))
            {
                clean.Append(c);
            }
            else if (c <= 0xFF)
            {
                clean.Append("\\x").Append(((int)c).ToString("x2", CultureInfo.InvariantCulture));
            }
            else
            {
                clean.Append("\\u").Append(((int)c).ToString("x4", CultureInfo.InvariantCulture));
            }
        }

        return clean.ToString();
    }

    private static bool Unsafe(char c) =>
        char.IsControl(c) || c is '\u2028' or '\u2029' || c is >= '\u202A' and <= '\u202E' || c is >= '\u2066' and <= '\u2069';
}
