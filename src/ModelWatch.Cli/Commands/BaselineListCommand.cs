using System.CommandLine;
using System.Globalization;
using ModelWatch.Cli.Operations;
using ModelWatch.Cli.Output;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch baseline list KEY [--format table|json]</c>: every version, and which one is active.</summary>
internal static class BaselineListCommand
{
    public static Command Create()
    {
        var key = new Argument<string>("key") { Description = "The model's key" };
        var format = OperationOptions.Format();
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("list", "List a model's baseline versions and which one is active") { key, format, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "baseline list", database, async (databases, output, ct) =>
        {
            await ModelKeys.RequireAsync(databases, parse.GetRequiredValue(key), ct);
            string model = parse.GetRequiredValue(key);
            var repository = new BaselineRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout);
            BaselineVersions versions = await BaselineOutput.VersionsAsync(repository, model, ct);
            IReadOnlyList<StoredBaseline> baselines = await repository.ListAsync(model, ct);
            if (parse.GetValue(format) == OutputFormat.Json)
            {
                WriteJson(output, model, versions, baselines);
                return ExitCodes.Ok;
            }

            if (baselines.Count == 0)
            {
                output.WriteLine($"{model}: no baseline; runs are skipped until one is fitted ('modelwatch baseline fit') or imported ('modelwatch baseline import')");
                return ExitCodes.Ok;
            }

            string[] header = ["VERSION", "ACTIVE", "ORIGIN", "CREATED", "BY", "REFERENCE WINDOW", "ROWS", "RESIDUAL SD", "CONDITION"];
            List<string[]> rows = [header, .. baselines.Select(b => new[]
            {
                b.Version.ToString(CultureInfo.InvariantCulture),
                b.Version == versions.Active ? "ACTIVE" : string.Empty,
                BaselineOutput.Origin(b.Reference),
                CliJson.Time(b.CreatedAt) ?? "-",
                b.CreatedBy,
                BaselineOutput.Window(b),
                b.Reference.RowCount.ToString(CultureInfo.InvariantCulture),
                BaselineOutput.Number(b.Reference.ResidualStandardDeviation),
                BaselineOutput.Number(b.Reference.ConditionNumber),
            })];
            CliJson.WriteTable(output, rows);
            if (versions.Active is { } active && active != versions.Versions[^1])
            {
                output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"{model} is watched against version {active}, not the newest ({versions.Versions[^1]}): every check compares with version {active}"));
            }

            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }

    private static void WriteJson(TextWriter output, string model, BaselineVersions versions, IReadOnlyList<StoredBaseline> baselines) =>
        CliJson.Write(output, writer =>
        {
            writer.WriteStartObject();
            writer.WriteString("model", model);
            if (versions.Active is { } active)
            {
                writer.WriteNumber("active_version", active);
            }
            else
            {
                writer.WriteNull("active_version");
            }

            writer.WriteStartArray("versions");
            foreach (StoredBaseline b in baselines)
            {
                writer.WriteStartObject();
                writer.WriteNumber("version", b.Version);
                writer.WriteBoolean("active", b.Version == versions.Active);
                writer.WriteString("origin", BaselineOutput.Origin(b.Reference));
                writer.WriteString("created_at", CliJson.Time(b.CreatedAt));
                writer.WriteString("created_by", b.CreatedBy);
                BaselineOutput.WriteWindow(writer, b);
                writer.WriteNumber("row_count", b.Reference.RowCount);
                JsonNumbers.Write(writer, "residual_sd", b.Reference.ResidualStandardDeviation);
                JsonNumbers.Write(writer, "condition_number", b.Reference.ConditionNumber);
                writer.WriteString("design", b.DesignSignature);
                writer.WriteEndObject();
            }

            writer.WriteEndArray();
            writer.WriteEndObject();
        });
}
