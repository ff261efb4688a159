using System.CommandLine;
using Microsoft.Extensions.Configuration;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Store.Baselines;
using ModelWatch.Store.Configuration;
using ModelWatch.Store.Migrations;
using ModelWatch.Store.Specs;
using ModelWatch.Store.Windows;
using Npgsql;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// What the commands that use the state database share: the <c>--database</c> option, configuration
/// (<c>ConnectionStrings:State</c>, <c>Sources:&lt;name&gt;:ConnectionString</c>), RFC 3339 times, and one place that
/// turns every expected failure into a message on stderr and exit code 3.
/// </summary>
internal static class StoreCommandRunner
{
    /// <summary>Command timeout of the state database's short commands.</summary>
    public static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(60);

    public static Option<string?> DatabaseOption() => new("--database")
    {
        Description = "Connection string of the state database (default: configuration ConnectionStrings:State, env ConnectionStrings__State)",
    };

    /// <summary>Who made a change, for the created_by columns.</summary>
    public static string Actor => ModelWatch.Daemon.Alerts.Actors.CurrentPerson;

    /// <summary>Opens the databases and runs <paramref name="body"/>, mapping failures to messages and exit codes.</summary>
    public static async Task<int> RunAsync(ParseResult parse, string name, Option<string?> database, Func<StoreDataSources, TextWriter, CancellationToken, Task<int>> body, CancellationToken cancellationToken)
    {
        TextWriter error = parse.InvocationConfiguration.Error;
        try
        {
            IConfiguration configuration = ConnectionSettings.Load();
            foreach (string warning in DaemonSettings.Audit(configuration).Warnings)
            {
                error.WriteLine($"modelwatch {name}: configuration: {warning}");
            }

            await using var databases = new StoreDataSources(configuration, parse.GetValue(database));
            if (name != "migrate")
            {
                // An older build must not write into a newer schema, and a newer one needs the migrations first.
                await MigrationRunner.EnsureCurrentAsync(databases.State, CommandTimeout, cancellationToken);
            }

            return await body(databases, parse.InvocationConfiguration.Output, cancellationToken);
        }
        catch (ModelSpecException ex)
        {
            foreach (SpecProblem problem in ex.Problems)
            {
                error.WriteLine(problem.ToString());
            }

            error.WriteLine($"modelwatch {name}: {ex.Problems.Count} problem(s); nothing was written");
            return ExitCodes.RuntimeError;
        }
        catch (PostgresException ex) when (ex.SqlState is PostgresErrorCodes.UndefinedTable or PostgresErrorCodes.InvalidSchemaName)
        {
            error.WriteLine($"modelwatch {name}: the state database has no ModelWatch schema ({ex.MessageText}); run 'modelwatch migrate' first");
            return ExitCodes.RuntimeError;
        }
        catch (NpgsqlException ex) when (ex is not PostgresException)
        {
            error.WriteLine($"modelwatch {name}: cannot reach the state database: {ex.Message}");
            return ExitCodes.RuntimeError;
        }
        catch (Exception ex) when (ex is ModelNotFoundException or StoreConfigurationException or MigrationException or WindowReadException or BaselineException or FormatException or PostgresException or IOException)
        {
            error.WriteLine($"modelwatch {name}: {ex.Message}");
            return ExitCodes.RuntimeError;
        }
    }
}
