using System.Text.Json;
using ModelWatch.Cli.Output;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>The command line's JSON escapes only what JSON requires.</summary>
public sealed class CliJsonTests
{
    [Fact]
    public void Plus_angle_brackets_apostrophes_ampersands_and_letters_are_written_as_they_are()
    {
        const string text = "deployed RMSE 6.35 (+69 % MSE), p < 1e-9, z > 3 & the window's ×43 rows, café";
        using var output = new StringWriter();

        CliJson.Write(output, writer =>
        {
            writer.WriteStartObject();
            writer.WriteString("explanation", text);
            writer.WriteString("forged", "a \"quote\" \\ and\na line break\u001b[31m");
            writer.WriteEndObject();
        });

        string json = output.ToString();
        Assert.Contains(text, json, StringComparison.Ordinal);
        Assert.DoesNotContain("\\u00", json.Replace("\\u001B", string.Empty, StringComparison.Ordinal), StringComparison.Ordinal);
        // What JSON requires is still escaped, so the document stays valid and a terminal sees no escape code.
        Assert.Contains("a \\\"quote\\\" \\\\ and\\na line break\\u001B[31m", json, StringComparison.Ordinal);
        using JsonDocument parsed = JsonDocument.Parse(json);
        Assert.Equal(text, parsed.RootElement.GetProperty("explanation").GetString());
    }
}
