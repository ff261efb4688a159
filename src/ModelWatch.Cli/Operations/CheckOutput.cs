using System.Globalization;
using System.Text.Json;
using ModelWatch.Cli.Output;
using ModelWatch.Daemon.Runs;

namespace ModelWatch.Cli.Operations;

/// <summary>Prints the result of <c>check</c>: exactly the documented JSON fields, or a table for people.</summary>
internal static class CheckOutput
{
    public static void WriteJson(Utf8JsonWriter writer, RunOutcome outcome, IReadOnlyList<FindingLine> findings)
    {
        writer.WriteStartObject();
        writer.WriteString("model", outcome.ModelKey);
        writer.WriteString("slot", CliJson.Time(outcome.Slot));
        writer.WriteStartObject("window");
        writer.WriteString("start", CliJson.Time(outcome.WindowStart));
        writer.WriteString("end", CliJson.Time(outcome.WindowEnd));
        writer.WriteEndObject();
        writer.WriteString("status", outcome.Status.Name());
        writer.WriteString("reason", outcome.Reason);
        writer.WriteNumber("rows", outcome.RowsRead);
        FindingLine.WriteArray(writer, findings);
        writer.WriteEndObject();
    }

    public static void WriteTable(TextWriter output, RunOutcome outcome, IReadOnlyList<FindingLine> findings, IReadOnlyDictionary<string, int> skipped)
    {
        string worst = FindingLine.Worst(findings) is { } w ? FindingLine.NameOf(w) : "-";
        output.WriteLine($"model {outcome.ModelKey}, slot {CliJson.Time(outcome.Slot)}, window {CliJson.Time(outcome.WindowStart)} → {CliJson.Time(outcome.WindowEnd)}");
        output.WriteLine(string.Create(CultureInfo.InvariantCulture, $"status {outcome.Status.Name()}{(outcome.Reason is null ? string.Empty : " (" + TerminalText.Clean(outcome.Reason) + ")")}, {outcome.RowsRead} row(s) read, {outcome.RowsRejected} rejected, worst severity {worst}"));
        if (findings.Count > 0)
        {
            output.WriteLine();
            // The budgeted alpha is the same for every test of a run, so the table leaves it to --format json and explain
            // and keeps what differs from row to row: the value against its limit, and the p-value.
            List<string[]> rows = [["CHECK", "SEVERITY", "STATISTIC", "VALUE", "LIMIT", "P", "EXPLANATION"]];
            rows.AddRange(findings.Select(f => new[]
            {
                f.Check + (f.Subject is null ? string.Empty : "/" + f.Subject), f.SeverityName, f.Statistic, Number(f.Value), Number(f.Limit), Probability(f.PValue), f.Explanation,
            }));
            Terminal.WriteTable(output, rows, freeText: "EXPLANATION");
        }

        if (skipped.Count > 0)
        {
            output.WriteLine();
            output.WriteLine("skipped tests: " + string.Join(", ", skipped.Select(s => string.Create(CultureInfo.InvariantCulture, $"{s.Value} {s.Key}"))));
        }
    }

    /// <summary>
    /// A p-value in two significant digits, one below 0.001 (<c>0.47</c>, <c>0.0031</c>, <c>1e-5</c>): the order of magnitude is what is read, and
    /// below 1e-9 (where the explanations say "p &lt; 1e-9") the digits are beyond what the model's assumptions support.
    /// </summary>
    public static string Probability(double? value) => value switch
    {
        { } v when double.IsFinite(v) && v < 1e-9 => "<1e-9",
        { } v when double.IsFinite(v) && v >= 0.001 => v.ToString("G2", CultureInfo.InvariantCulture),
        { } v when double.IsFinite(v) => v.ToString("0e0", CultureInfo.InvariantCulture),
        _ => "-",
    };

    public static string Number(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("G4", CultureInfo.InvariantCulture) : "-";
}
