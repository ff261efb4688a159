using System.Collections.Concurrent;
using ModelWatch.Cli.Demo;

namespace ModelWatch.Cli.Tests.Demo;

public sealed class AcceleratedClockTests
{
    private static readonly DateTimeOffset Start = new(2026, 3, 9, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void The_clock_stands_still_until_it_is_run()
    {
        var clock = new AcceleratedClock(Start, 60_000, Start.AddDays(1));

        Assert.Equal(Start, clock.GetUtcNow());
        Assert.Equal(Start, clock.GetUtcNow());
    }

    [Fact]
    public async Task Timers_fire_in_the_order_of_their_simulated_due_times_and_not_before_them()
    {
        // One simulated hour is one real second: wide enough that a busy machine's thread pool keeps the order.
        var clock = new AcceleratedClock(Start, 3_600, Start.AddDays(1));
        var fired = new ConcurrentQueue<(int Hours, DateTimeOffset At)>();
        var all = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
        clock.Run();
        var timers = new List<ITimer>();
        foreach (int hours in new[] { 3, 1, 2 })
        {
            timers.Add(clock.CreateTimer(
                _ =>
                {
                    fired.Enqueue((hours, clock.GetUtcNow()));
                    if (fired.Count == 3)
                    {
                        all.TrySetResult();
                    }
                },
                null,
                TimeSpan.FromHours(hours),
                Timeout.InfiniteTimeSpan));
        }

        await all.Task.WaitAsync(TimeSpan.FromSeconds(30));
        foreach (ITimer timer in timers)
        {
            await timer.DisposeAsync();
        }

        Assert.Equal([1, 2, 3], fired.Select(f => f.Hours));
        Assert.All(fired, f => Assert.True(f.At >= Start.AddHours(f.Hours), $"{f.Hours} h timer fired at {f.At:O}"));
    }

    [Fact]
    public async Task A_delay_through_the_clock_ends_after_the_simulated_time_has_passed()
    {
        var clock = new AcceleratedClock(Start, 360_000, Start.AddDays(2));
        clock.Run();

        await Task.Delay(TimeSpan.FromHours(10), clock).WaitAsync(TimeSpan.FromSeconds(30));

        Assert.True(clock.GetUtcNow() >= Start.AddHours(10), clock.GetUtcNow().ToString("O", System.Globalization.CultureInfo.InvariantCulture));
    }

    [Fact]
    public async Task A_timer_due_after_the_end_never_fires()
    {
        DateTimeOffset end = Start.AddHours(1);
        var clock = new AcceleratedClock(Start, 1_000_000, end);
        int lateFired = 0;
        var earlyFired = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
        // Both timers are armed before the clock flows: at this speed its whole hour lasts 3.6 ms of real time, less than
        // a busy machine may take between two statements, so a timer armed afterwards could already be due past the end.
        await using ITimer late = clock.CreateTimer(_ => Interlocked.Increment(ref lateFired), null, TimeSpan.FromHours(2), Timeout.InfiniteTimeSpan);
        await using ITimer early = clock.CreateTimer(_ => earlyFired.TrySetResult(), null, TimeSpan.FromMinutes(30), Timeout.InfiniteTimeSpan);
        clock.Run();
        await earlyFired.Task.WaitAsync(TimeSpan.FromSeconds(30));
        while (clock.Flowing)
        {
            await Task.Delay(10);
        }

        // Several real periods of the late timer (7.2 ms each at this speed) pass while the clock stands still.
        await Task.Delay(200);

        Assert.Equal(0, Volatile.Read(ref lateFired));
    }

    [Fact]
    public async Task The_clock_stops_at_its_end()
    {
        DateTimeOffset end = Start.AddHours(1);
        var clock = new AcceleratedClock(Start, 1_000_000, end);
        clock.Run();
        while (clock.GetUtcNow() < end)
        {
            await Task.Delay(10);
        }

        await Task.Delay(50);

        Assert.Equal(end, clock.GetUtcNow());
    }
}
