using System.Globalization;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Cli.Csv;

/// <summary>
/// Streams a CSV file with a header row into a <see cref="LeastSquaresAccumulator"/>: one line at a time,
/// numbers parsed with the invariant culture (<c>.11019</c> and <c>760.</c> are accepted), any bad cell
/// reported with its line number and column.
/// </summary>
internal static class CsvDesignReader
{
    public static AugmentedFactor Read(string path, string target, IReadOnlyList<string>? features, bool intercept)
    {
        using var reader = new StreamReader(path);
        string? headerLine = reader.ReadLine();
        long lineNumber = 1;
        while (headerLine is not null && string.IsNullOrWhiteSpace(headerLine))
        {
            headerLine = reader.ReadLine();
            lineNumber++;
        }

        if (headerLine is null)
        {
            throw new CsvFormatException($"{path}: the file is empty; expected a header row naming the columns");
        }

        List<string> header = CsvLineSplitter.Split(headerLine.TrimStart('\uFEFF'), path, lineNumber);
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int i = 0; i < header.Count; i++)
        {
            if (!index.TryAdd(header[i], i))
            {
                throw new CsvFormatException($"{path}: line {lineNumber}: column '{header[i]}' appears twice in the header");
            }
        }

        int targetIndex = Find(index, target, path, "target");
        IReadOnlyList<string> chosen = features is { Count: > 0 } ? features : header.Where(h => h != target).ToList();
        int[] featureIndex = chosen.Select(f => Find(index, f, path, "feature")).ToArray();
        var layout = new DesignLayout(chosen, target, intercept);
        var accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.Fail);
        var row = new double[featureIndex.Length];
        string? line;
        while ((line = reader.ReadLine()) is not null)
        {
            lineNumber++;
            if (string.IsNullOrWhiteSpace(line))
            {
                continue;
            }

            List<string> cells = CsvLineSplitter.Split(line, path, lineNumber);
            if (cells.Count != header.Count)
            {
                throw new CsvFormatException($"{path}: line {lineNumber}: {cells.Count} fields, but the header has {header.Count}");
            }

            for (int i = 0; i < featureIndex.Length; i++)
            {
                row[i] = Parse(cells[featureIndex[i]], header[featureIndex[i]], path, lineNumber);
            }

            double y = Parse(cells[targetIndex], target, path, lineNumber);
            try
            {
                accumulator.AddRow(row, y);
            }
            catch (NonFiniteValueException ex)
            {
                throw new CsvFormatException($"{path}: line {lineNumber}: column '{ex.Column}' is not a finite number", ex);
            }
        }

        return accumulator.ToFactor();
    }

    private static int Find(Dictionary<string, int> index, string column, string path, string role) =>
        index.TryGetValue(column, out int i)
            ? i
            : throw new CsvFormatException($"{path}: {role} column '{column}' is not in the header (columns: {string.Join(", ", index.Keys)})");

    private static double Parse(string cell, string column, string path, long lineNumber)
    {
        if (cell.Length == 0)
        {
            throw new CsvFormatException($"{path}: line {lineNumber}: column '{column}' is empty");
        }

        if (!double.TryParse(cell, NumberStyles.Float, CultureInfo.InvariantCulture, out double value))
        {
            throw new CsvFormatException($"{path}: line {lineNumber}: column '{column}' holds '{cell}', which is not a number");
        }

        return value;
    }
}
