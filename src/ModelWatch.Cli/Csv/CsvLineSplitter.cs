using System.Text;

namespace ModelWatch.Cli.Csv;

/// <summary>Splits one CSV line on commas, honouring double-quoted fields (RFC 4180 quoting within a line).</summary>
internal static class CsvLineSplitter
{
    public static List<string> Split(string line, string path, long lineNumber)
    {
        var fields = new List<string>();
        var current = new StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            char ch = line[i];
            if (quoted)
            {
                if (ch == '"' && i + 1 < line.Length && line[i + 1] == '"')
                {
                    current.Append('"');
                    i++;
                }
                else if (ch == '"')
                {
                    quoted = false;
                }
                else
                {
                    current.Append(ch);
                }
            }
            else if (ch == '"')
            {
                quoted = true;
            }
            else if (ch == ',')
            {
                fields.Add(current.ToString().Trim());
                current.Clear();
            }
            else
            {
                current.Append(ch);
            }
        }

        if (quoted)
        {
            throw new CsvFormatException($"{path}: line {lineNumber}: a quoted field is not closed");
        }

        fields.Add(current.ToString().Trim());
        return fields;
    }
}
