using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;

namespace ModelWatch.Daemon.Hosting;

/// <summary>
/// Why a host stopped, if not because it was asked to: a background service whose loop ended in an exception stops
/// the host (the default <see cref="BackgroundServiceExceptionBehavior.StopHost"/>), yet the host's run returns
/// normally (and disposes the host), so the services are taken before the run and the exit code is decided from them.
/// </summary>
public sealed class HostFaults
{
    private readonly BackgroundService[] _services;

    private HostFaults(BackgroundService[] services) => _services = services;

    /// <summary>Watches the host's background services; call before running it.</summary>
    public static HostFaults Watch(IHost host)
    {
        ArgumentNullException.ThrowIfNull(host);
        return new HostFaults([.. host.Services.GetServices<IHostedService>().OfType<BackgroundService>()]);
    }

    /// <summary>The background services that faulted, with their exceptions.</summary>
    public IReadOnlyList<(string Service, Exception Fault)> Faults =>
        [.. _services.Where(s => s.ExecuteTask is { IsFaulted: true }).Select(s => (s.GetType().Name, s.ExecuteTask!.Exception!.GetBaseException()))];
}
