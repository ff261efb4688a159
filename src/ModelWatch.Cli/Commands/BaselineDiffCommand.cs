using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using ModelWatch.Checks.Summaries;
using ModelWatch.Cli.Operations;
using ModelWatch.Cli.Output;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch baseline diff KEY A B [--format table|json]</c>: per term the two coefficients, B − A, and that
/// difference in standard errors of A (where A's are known); then residual SD and condition number.
/// </summary>
internal static class BaselineDiffCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var first = new Argument<int>("a") { Description = "The version to compare from" };
        var second = new Argument<int>("b") { Description = "The version to compare with it" };
        var format = OperationOptions.Format();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("diff", "Compare two baseline versions term by term") { key, first, second, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline diff", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            string model = parse.GetRequiredValue(key);
            var repository = new BaselineRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            BaselineVersions versions = await BaselineOutput.VersionsAsync(repository, model, ct);
            StoredBaseline a = await BaselineOutput.VersionAsync(repository, model, versions, parse.GetValue(first), ct);
            StoredBaseline b = await BaselineOutput.VersionAsync(repository, model, versions, parse.GetValue(second), ct);
            List<TermDifference> terms = Terms(a.Reference, b.Reference);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                CliJson.Write(output, writer => WriteJson(writer, a, b, terms));
                return ExitCodes.Ok;
            }

            output.WriteLine(Invariant($"{model}: baseline {a.Version} ({BaselineOutput.Origin(a.Reference)}) against {b.Version} ({BaselineOutput.Origin(b.Reference)})"));
            string va = a.Version.ToString(CultureInfo.InvariantCulture);
            string vb = b.Version.ToString(CultureInfo.InvariantCulture);
            List<string[]> rows = [["TERM", $"V{va}", $"V{vb}", $"V{vb} - V{va}", $"IN SE OF V{va}"]];
            rows.AddRange(terms.Select(t => new[]
            {
                t.Term, BaselineOutput.Number(t.A), BaselineOutput.Number(t.B), BaselineOutput.Number(t.Difference), BaselineOutput.Number(t.InStandardErrors),
            }));
            CliJson.WriteTable(output, rows);
            output.WriteLine(Line("residual SD", a.Reference.ResidualStandardDeviation, b.Reference.ResidualStandardDeviation));
            output.WriteLine(Line("condition number", a.Reference.ConditionNumber, b.Reference.ConditionNumber));
            if (a.DesignSignature != b.DesignSignature)
            {
                output.WriteLine($"designs differ: {a.DesignSignature} against {b.DesignSignature}");
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    /// <summary>A's terms in its spec order, then any term only B has.</summary>
    private static List<TermDifference> Terms(BaselineReference a, BaselineReference b)
    {
        double?[] errors = BaselineOutput.StandardErrors(a);
        IReadOnlyList<string> termsA = a.ToLayout().Terms;
        var result = new List<TermDifference>();
        foreach (string term in termsA.Concat(b.ToLayout().Terms.Where(t => !termsA.Contains(t))))
        {
            double? x = a.Coefficients.TryGetValue(term, out double va) ? va : null;
            double? y = b.Coefficients.TryGetValue(term, out double vb) ? vb : null;
            double? difference = x is not null && y is not null ? y - x : null;
            int index = IndexOf(termsA, term);
            double? se = index >= 0 ? errors[index] : null;
            result.Add(new TermDifference(term, x, y, difference, difference is not null && se is > 0 ? difference / se : null));
        }

        return result;
    }

    private static int IndexOf(IReadOnlyList<string> terms, string term)
    {
        for (int i = 0; i < terms.Count; i++)
        {
            if (terms[i] == term)
            {
                return i;
            }
        }

        return -1;
    }

    private static string Line(string name, double? a, double? b) =>
        $"{name}: {BaselineOutput.Number(a)} -> {BaselineOutput.Number(b)}"
        + (a is { } x && b is { } y && double.IsFinite(x) && double.IsFinite(y) && x != 0 ? Invariant($" (x{y / x:G4})") : string.Empty);

    private static void WriteJson(Utf8JsonWriter writer, StoredBaseline a, StoredBaseline b, List<TermDifference> terms)
    {
        writer.WriteStartObject();
        writer.WriteString("model", a.ModelKey);
        writer.WriteNumber("a", a.Version);
        writer.WriteNumber("b", b.Version);
        writer.WriteStartArray("terms");
        foreach (TermDifference t in terms)
        {
            writer.WriteStartObject();
            writer.WriteString("term", t.Term);
            JsonNumbers.Write(writer, "a", t.A);
            JsonNumbers.Write(writer, "b", t.B);
            JsonNumbers.Write(writer, "difference", t.Difference);
            JsonNumbers.Write(writer, "difference_in_se_of_a", t.InStandardErrors);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        Pair(writer, "residual_sd", a.Reference.ResidualStandardDeviation, b.Reference.ResidualStandardDeviation);
        Pair(writer, "condition_number", a.Reference.ConditionNumber, b.Reference.ConditionNumber);
        writer.WriteBoolean("same_design", a.DesignSignature == b.DesignSignature);
        writer.WriteEndObject();
    }

    private static void Pair(Utf8JsonWriter writer, string name, double? a, double? b)
    {
        writer.WriteStartObject(name);
        JsonNumbers.Write(writer, "a", a);
        JsonNumbers.Write(writer, "b", b);
        JsonNumbers.Write(writer, "difference", a is not null && b is not null ? b - a : null);
        writer.WriteEndObject();
    }

    private static string Invariant(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);

    /// <summary>One term of the comparison.</summary>
    private sealed record TermDifference(string Term, double? A, double? B, double? Difference, double? InStandardErrors);
}
