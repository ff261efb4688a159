using System.CommandLine;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Windows;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch model validate KEY|FILE</c>: checks the spec (a file, or the registered model) and describes its
/// query against its data source, reading no rows, reporting each missing or mistyped column.
/// </summary>
internal static class ModelValidateCommand
{
    public static Command Create()
    {
        var target = new Argument<string>("key-or-file") { Description = "A registered model's key, or a spec file" };
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("validate", "Check a spec and its query's columns against the data source, without reading rows") { target, database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "model validate", database, async (databases, output, ct) =>
        {
            string value = parse.GetRequiredValue(target);
            ModelSpec spec;
            if (File.Exists(value))
            {
                spec = ModelSpecFiles.Load(value)[0].Spec;
            }
            else
            {
                if (value.Contains('/', StringComparison.Ordinal) || value.EndsWith(".yaml", StringComparison.OrdinalIgnoreCase) || value.EndsWith(".yml", StringComparison.OrdinalIgnoreCase))
                {
                    throw new FormatException($"{value}: no such spec file");
                }

                spec = (await ModelKeys.RequireAsync(databases, value, ct)).Spec;
            }

            (DateTimeOffset start, DateTimeOffset end) = spec.WindowForSlot(spec.Schedule.SlotAtOrBefore(TimeProvider.System.GetUtcNow()) ?? TimeProvider.System.GetUtcNow());
            IReadOnlyList<WindowReadException> problems = await new WindowReader(databases.ReadOptions()).ValidateAsync(databases.Source(spec.Source), spec, start, end, ct);
            foreach (WindowReadException problem in problems)
            {
                parse.InvocationConfiguration.Error.WriteLine(problem.Message);
            }

            if (problems.Count > 0)
            {
                parse.InvocationConfiguration.Error.WriteLine($"modelwatch model validate: {problems.Count} column problem(s)");
                return ExitCodes.RuntimeError;
            }

            // The source role's privileges beyond reading: warnings, since only the database's owner can close them.
            foreach (string warning in await SourceRoleAudit.WarningsAsync(databases.Source(spec.Source), spec, ct))
            {
                parse.InvocationConfiguration.Error.WriteLine("modelwatch model validate: warning: " + warning);
            }

            output.WriteLine($"{spec.Key}: spec valid; query columns match ({spec.DesignSignature}, ordered by {spec.TimeColumn})");
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
