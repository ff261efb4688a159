using System.Globalization;
using System.Text;
using System.Text.Json;

namespace ModelWatch.Cli.Output;

/// <summary>Shared JSON and time formatting for command output: indented JSON, RFC 3339 UTC times with <c>Z</c>.</summary>
internal static class CliJson
{
    public static void Write(TextWriter output, Action<Utf8JsonWriter> write)
    {
        using var buffer = new MemoryStream();
        using (var writer = new Utf8JsonWriter(buffer, new JsonWriterOptions { Indented = true }))
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
    public static void WriteTable(TextWriter output, IReadOnlyList<string[]> cells, int? freeTextColumn = null) =>
        TextTable.Write(output, cells, freeTextColumn);
}
