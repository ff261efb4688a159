using System.CommandLine;
using Microsoft.Extensions.Options;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using Npgsql;

namespace ModelWatch.Cli.Demo;

/// <summary><c>modelwatch demo [--keep] [--database CS]</c>: the whole job on invented data, in about a minute.</summary>
internal static class DemoCommand
{
    public static Command Create()
    {
        var database = new Option<string?>("--database")
        {
            Description = "Run on this PostgreSQL database (15 or later) instead of starting a throwaway one; it must watch no other models",
        };
        var keep = new Option<bool>("--keep") { Description = "Leave the throwaway database running at the end and print its connection string (stop it later with --stop)" };
        var stop = new Option<bool>("--stop") { Description = "Stop and remove the throwaway databases earlier demos left running with --keep, then exit" };
        var command = new Command("demo", "Seed an invented courier scenario with three incidents, run the real daemon over five weeks on a fast clock, and show what it raised") { database, keep, stop };
        command.Validators.Add(result =>
        {
            if (result.GetValue(stop) && (result.GetValue(keep) || result.GetResult(database) is not null))
            {
                result.AddError("--stop runs no demo: give it alone, without --keep or --database");
            }
        });
        command.SetAction(async (parse, cancellationToken) =>
        {
            TextWriter error = parse.InvocationConfiguration.Error;
            if (parse.GetValue(stop))
            {
                return await StopAsync(parse.InvocationConfiguration.Output, error, cancellationToken);
            }

            var runner = new DemoRunner(parse.InvocationConfiguration.Output, error);
            try
            {
                return await runner.RunAsync(parse.GetValue(database), ConfiguredState(), parse.GetValue(keep), cancellationToken);
            }
            catch (Exception ex) when (ex is DemoException or NpgsqlException or MigrationException or StoreConfigurationException or OptionsValidationException or InvalidOperationException or IOException)
            {
                error.WriteLine($"modelwatch demo: {ex.Message}");
                return ExitCodes.RuntimeError;
            }
        });
        return command;
    }

    private static async Task<int> StopAsync(TextWriter output, TextWriter error, CancellationToken cancellationToken)
    {
        if (await KeptDemoDatabases.StopAllAsync(output, cancellationToken) == 0)
        {
            await error.WriteLineAsync($"modelwatch demo: no kept demo database found (none recorded under {KeptDemoDatabases.Folder}); a database given with --database is yours to stop");
            return ExitCodes.RuntimeError;
        }

        return ExitCodes.Ok;
    }

    // ConnectionStrings__State (or appsettings.json) is the last resort, after a local server the demo can start itself.
    private static string? ConfiguredState() => ConnectionSettings.Load()[ConnectionSettings.StateKey] is { Length: > 0 } configured ? configured : null;
}
