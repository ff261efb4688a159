using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using ModelWatch.Daemon.Hosting;

namespace ModelWatch.Daemon.Tests.Hosting;

public sealed class HostFaultsTests
{
    [Fact]
    public async Task A_faulted_background_service_stops_the_host_and_is_reported_while_a_requested_stop_is_not()
    {
        HostApplicationBuilder faulty = Host.CreateEmptyApplicationBuilder(new HostApplicationBuilderSettings());
        faulty.Services.AddHostedService<FaultingLoop>();
        using IHost broken = faulty.Build();

        // The host stops by itself, and its run returns normally: the exit code must come from the faults.
        HostFaults watched = HostFaults.Watch(broken);
        await broken.RunAsync().WaitAsync(TimeSpan.FromSeconds(30));
        (string service, Exception fault) = Assert.Single(watched.Faults);
        Assert.Equal(nameof(FaultingLoop), service);
        Assert.Equal("the loop broke", fault.Message);

        HostApplicationBuilder healthy = Host.CreateEmptyApplicationBuilder(new HostApplicationBuilderSettings());
        healthy.Services.AddHostedService<QuietLoop>();
        using IHost quiet = healthy.Build();
        HostFaults calm = HostFaults.Watch(quiet);
        await quiet.StartAsync();
        await quiet.StopAsync();
        Assert.Empty(calm.Faults);
    }

    private sealed class FaultingLoop : BackgroundService
    {
        protected override async Task ExecuteAsync(CancellationToken stoppingToken)
        {
            await Task.Yield();
            throw new InvalidOperationException("the loop broke");
        }
    }

    private sealed class QuietLoop : BackgroundService
    {
        protected override Task ExecuteAsync(CancellationToken stoppingToken) => Task.Delay(Timeout.Infinite, stoppingToken).ContinueWith(_ => { }, TaskScheduler.Default);
    }
}
