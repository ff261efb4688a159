namespace ModelWatch.Daemon.Benchmarks;

/// <summary>
/// The system clock shifted to a chosen moment: real elapsed time (so stage timings are real) in the data's past.
/// <see cref="JumpTo"/> moves it between measured passes, never during one.
/// </summary>
internal sealed class ShiftedTimeProvider(DateTimeOffset startAt) : TimeProvider
{
    private long _offsetTicks = (startAt - System.GetUtcNow()).Ticks;

    public override DateTimeOffset GetUtcNow() => System.GetUtcNow() + TimeSpan.FromTicks(Interlocked.Read(ref _offsetTicks));

    public void JumpTo(DateTimeOffset moment) => Interlocked.Exchange(ref _offsetTicks, (moment - System.GetUtcNow()).Ticks);
}
