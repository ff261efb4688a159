using System.CommandLine;
using ModelWatch.Store.Migrations;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch migrate [--database CS]</c>: brings the state database to this build's schema.</summary>
internal static class MigrateCommand
{
    public static Command Create()
    {
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("migrate", "Create or upgrade the state database's schema (safe to run from several replicas at once)") { database };
        command.SetAction((parse, cancellationToken) => StoreCommandRunner.RunAsync(parse, "migrate", database, async (databases, output, ct) =>
        {
            MigrationResult result = await MigrationRunner.MigrateAsync(databases.State, StoreCommandRunner.CommandTimeout, ct);
            output.WriteLine(result.Applied.Count == 0
                ? $"schema is current (version {result.CurrentVersion})"
                : $"applied migration(s) {string.Join(", ", result.Applied)}; schema version {result.CurrentVersion}");
            return ExitCodes.Ok;
        }, cancellationToken));
        return command;
    }
}
