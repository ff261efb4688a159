namespace ModelWatch.Cli.Demo;

/// <summary>
/// A real timer whose due time and period are simulated durations divided by the clock's factor. The real timer queue
/// counts coarse milliseconds and may wake a little early; a wake-up before the simulated due time re-arms the timer for
/// the rest, so the callback never runs before its time on the accelerated clock.
/// </summary>
internal sealed class ScaledTimer : ITimer
{
    private static readonly TimeSpan StandingStillRecheck = TimeSpan.FromMilliseconds(50);

    private readonly AcceleratedClock _clock;
    private readonly TimerCallback _callback;
    private readonly object? _state;
    private readonly ITimer _inner;
    private readonly Lock _gate = new();
    private DateTimeOffset _dueAt;
    private TimeSpan _period;

    public ScaledTimer(AcceleratedClock clock, TimerCallback callback, object? state, TimeSpan dueTime, TimeSpan period)
    {
        _clock = clock;
        _callback = callback;
        _state = state;
        _inner = TimeProvider.System.CreateTimer(_ => Fire(), null, Timeout.InfiniteTimeSpan, Timeout.InfiniteTimeSpan);
        Change(dueTime, period);
    }

    public bool Change(TimeSpan dueTime, TimeSpan period)
    {
        lock (_gate)
        {
            _period = period;
            _dueAt = dueTime == Timeout.InfiniteTimeSpan ? DateTimeOffset.MaxValue : _clock.GetUtcNow() + dueTime;
            return _inner.Change(Scale(dueTime), Timeout.InfiniteTimeSpan);
        }
    }

    public void Dispose() => _inner.Dispose();

    public ValueTask DisposeAsync() => _inner.DisposeAsync();

    private void Fire()
    {
        lock (_gate)
        {
            TimeSpan remaining = _dueAt - _clock.GetUtcNow();
            if (remaining > TimeSpan.Zero)
            {
                // While the clock stands still (not started, or stopped at its end) time will not come by itself.
                _inner.Change(_clock.Flowing ? Scale(remaining) : StandingStillRecheck, Timeout.InfiniteTimeSpan);
                return;
            }

            bool periodic = _period != Timeout.InfiniteTimeSpan && _period > TimeSpan.Zero;
            _dueAt = periodic ? _dueAt + _period : DateTimeOffset.MaxValue;
            if (periodic)
            {
                _inner.Change(Scale(_dueAt - _clock.GetUtcNow()), Timeout.InfiniteTimeSpan);
            }
        }

        _callback(_state);
    }

    private TimeSpan Scale(TimeSpan simulated)
    {
        if (simulated == Timeout.InfiniteTimeSpan)
        {
            return simulated;
        }

        // Rounded up, so a positive simulated time never becomes an immediate real one.
        return simulated <= TimeSpan.Zero ? TimeSpan.Zero : TimeSpan.FromTicks(Math.Max(1, (long)Math.Ceiling(simulated.Ticks / _clock.Factor)));
    }
}
