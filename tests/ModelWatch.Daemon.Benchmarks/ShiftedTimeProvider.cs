namespace ModelWatch.Daemon.Benchmarks;

/// <summary>The system clock shifted to a chosen moment: real elapsed time (so stage timings are real) in the data's past.</summary>
internal sealed class ShiftedTimeProvider(DateTimeOffset startAt) : TimeProvider
{
    private readonly TimeSpan _offset = startAt - System.GetUtcNow();

    public override DateTimeOffset GetUtcNow() => System.GetUtcNow() + _offset;
}
