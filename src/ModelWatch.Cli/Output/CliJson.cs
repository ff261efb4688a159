using System.Globalization;
using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;

namespace ModelWatch.Cli.Output;

/// <summary>Shared JSON and time formatting for command output: indented JSON, RFC 3339 UTC times with <c>Z</c>.</summary>
internal static class CliJson
{
    /// <summary>
    /// The writer settings of every JSON document the command line prints: indented, and escaping only what JSON
    /// requires (quotes, backslashes, control characters), so "+69 %", "a > b", "the window's" and "×43" read as
    /// written. The default encoder also escapes <c>+ &lt; &gt; ' &amp;</c> and every non-ASCII letter so that JSON
    /// can be pasted into HTML safely; this output goes to terminals, files and scripts, never into a web page, so
    /// the relaxed encoder is safe here.
    /// </summary>
    public static readonly JsonWriterOptions Options = new() { Indented = true, Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    public static void Write(TextWriter output, Action<Utf8JsonWriter> write)
    {
        using var buffer = new MemoryStream();
        using (var writer = new Utf8JsonWriter(buffer, Options))
        {
            write(writer);
        }

        output.WriteLine(Encoding.UTF8.GetString(buffer.ToArray()));
    }

    public static string? Time(DateTime? utc) =>
        utc is { } t ? DateTime.SpecifyKind(t, DateTimeKind.Utc).ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture) : null;

    public static string? Time(DateTimeOffset? value) =>
        value?.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);

    public static void WriteTime(Utf8JsonWriter writer, string name, DateTime? utc)
    {
        if (Time(utc) is { } text)
        {
            writer.WriteString(name, text);
        }
        else
        {
            writer.WriteNull(name);
        }
    }

    /// <summary>Prints rows as aligned columns, the first row being the header (see <see cref="TextTable"/>).</summary>
    public static void WriteTable(TextWriter output, IReadOnlyList<string[]> cells, string? freeText = null) =>
        TextTable.Write(output, cells, freeText);
}
