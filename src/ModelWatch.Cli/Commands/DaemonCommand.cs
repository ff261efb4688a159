using System.CommandLine;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch daemon [--database CS]</c>: runs the scheduler until SIGTERM or Ctrl+C.</summary>
internal static class DaemonCommand
{
    public static Command Create()
    {
        var database = StoreCommandRunner.DatabaseOption();
        var command = new Command("daemon", "Run the monitoring daemon: claim due models, run them, record runs and alerts, emit telemetry") { database };
        command.SetAction(async (parse, cancellationToken) =>
        {
            TextWriter error = parse.InvocationConfiguration.Error;
            IHost? host = null;
            try
            {
                host = DaemonHost.Build([], parse.GetValue(database));

                // Resolve the databases before starting, so a missing connection string is one line, not a host failure.
                _ = host.Services.GetRequiredService<StoreDataSources>();

                // The host owns SIGTERM and Ctrl+C (its lifetime), so in-flight runs get the full shutdown timeout.
                await host.RunAsync(CancellationToken.None);
                return ExitCodes.Ok;
            }
            catch (OptionsValidationException ex)
            {
                foreach (string failure in ex.Failures)
                {
                    error.WriteLine($"modelwatch daemon: configuration: {failure}");
                }

                return ExitCodes.RuntimeError;
            }
            catch (Exception ex) when (ex is StoreConfigurationException or InvalidOperationException or FormatException or IOException)
            {
                error.WriteLine($"modelwatch daemon: {ex.Message}");
                return ExitCodes.RuntimeError;
            }
            finally
            {
                host?.Dispose();
            }
        });
        return command;
    }
}
