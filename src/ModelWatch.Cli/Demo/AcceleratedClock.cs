namespace ModelWatch.Cli.Demo;

/// <summary>
/// A clock whose time runs <see cref="Factor"/> times faster than real time from <see cref="Start"/>, and whose timers
/// fire after their due time divided by the factor, so the whole daemon (polls, delays, leases) lives through weeks in
/// seconds. Before <see cref="Run"/> it stands still; after <see cref="StopAt"/> it stands still again, so nothing
/// after the end of the demo's data ever becomes due.
/// </summary>
internal sealed class AcceleratedClock : TimeProvider
{
    private long _startedAt = -1;

    public AcceleratedClock(DateTimeOffset start, double factor, DateTimeOffset stopAt)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(factor, 1.0);
        ArgumentOutOfRangeException.ThrowIfLessThan(stopAt, start);
        Start = start;
        Factor = factor;
        StopAt = stopAt;
    }

    /// <summary>The simulated time at which the clock starts.</summary>
    public DateTimeOffset Start { get; }

    /// <summary>Simulated seconds per real second.</summary>
    public double Factor { get; }

    /// <summary>The simulated time at which the clock stops.</summary>
    public DateTimeOffset StopAt { get; }

    /// <summary>Whether time flows now: the clock has been run and has not reached <see cref="StopAt"/>.</summary>
    public bool Flowing => Interlocked.Read(ref _startedAt) >= 0 && GetUtcNow() < StopAt;

    /// <summary>Lets time flow from now on.</summary>
    public void Run() => Interlocked.CompareExchange(ref _startedAt, TimeProvider.System.GetTimestamp(), -1);

    /// <inheritdoc />
    public override DateTimeOffset GetUtcNow()
    {
        long started = Interlocked.Read(ref _startedAt);
        if (started < 0)
        {
            return Start;
        }

        double simulatedTicks = TimeProvider.System.GetElapsedTime(started).Ticks * Factor;
        long limit = (StopAt - Start).Ticks;
        return Start + TimeSpan.FromTicks(simulatedTicks >= limit ? limit : (long)simulatedTicks);
    }

    /// <inheritdoc />
    public override ITimer CreateTimer(TimerCallback callback, object? state, TimeSpan dueTime, TimeSpan period) =>
        new ScaledTimer(this, callback, state, dueTime, period);
}
