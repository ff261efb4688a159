using System.CommandLine;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Store.Configuration;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch daemon [--database CS]</c>: runs the scheduler until SIGTERM or Ctrl+C. Exit 0 after a requested stop;
/// 3 when the configuration has problems (all listed) or the endpoint cannot listen; 4 when a fault stopped it.
/// </summary>
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
                HostFaults watched = HostFaults.Watch(host);
                await host.RunAsync(CancellationToken.None);
                IReadOnlyList<(string Service, Exception Fault)> faults = watched.Faults;
                foreach ((string service, Exception fault) in faults)
                {
                    error.WriteLine($"modelwatch daemon: stopped by a fault in {service}: {fault.GetType().Name}: {fault.Message}");
                }

                return faults.Count == 0 ? ExitCodes.Ok : ExitCodes.DaemonFault;
            }
            catch (DaemonConfigurationException ex)
            {
                foreach (string problem in ex.Problems)
                {
                    error.WriteLine($"modelwatch daemon: configuration: {problem}");
                }

                error.WriteLine($"modelwatch daemon: {ex.Problems.Count} configuration problem(s); nothing started");
                return ExitCodes.RuntimeError;
            }
            catch (OptionsValidationException ex)
            {
                foreach (string failure in ex.Failures)
                {
                    error.WriteLine($"modelwatch daemon: configuration: {failure}");
                }

                return ExitCodes.RuntimeError;
            }
            catch (Exception ex) when (ex is System.Net.Sockets.SocketException || (ex is IOException && (ex.InnerException is System.Net.Sockets.SocketException || ex.Message.Contains("bind", StringComparison.OrdinalIgnoreCase))))
            {
                // An address in use, or one this host does not have: the endpoint cannot start, so neither does the daemon.
                error.WriteLine($"modelwatch daemon: the HTTP endpoint cannot listen (Http:Urls): {ex.Message}");
                return ExitCodes.RuntimeError;
            }
            catch (Exception ex) when (ex is StoreConfigurationException or InvalidOperationException or FormatException or IOException)
            {
                error.WriteLine($"modelwatch daemon: {ex.Message}");
                return ExitCodes.RuntimeError;
            }
            catch (Exception ex) when (ex is not OutOfMemoryException)
            {
                error.WriteLine($"modelwatch daemon: stopped by a fault: {ex.GetType().Name}: {ex.Message}");
                return ExitCodes.DaemonFault;
            }
            finally
            {
                if (host is IAsyncDisposable asynchronous)
                {
                    await asynchronous.DisposeAsync();
                }
                else
                {
                    host?.Dispose();
                }
            }
        });
        return command;
    }
}
