using System.Threading.Channels;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Tells this process's <see cref="NotificationDispatcher"/> that notifications were just queued, so it delivers them
/// at once instead of at its next poll. Only a nudge: the queue itself is the <c>modelwatch.notification</c> table,
/// and a nudge that is lost (or never sent, as by another process) costs at most one poll interval.
/// </summary>
public sealed class NotificationWakeup
{
    private readonly Channel<bool> _nudges = Channel.CreateBounded<bool>(new BoundedChannelOptions(1) { FullMode = BoundedChannelFullMode.DropWrite });

    /// <summary>Wakes the dispatcher (repeated nudges before it wakes count as one).</summary>
    public void Wake() => _nudges.Writer.TryWrite(true);

    /// <summary>Waits for a nudge or for <paramref name="timeout"/> on <paramref name="time"/>, whichever comes first.</summary>
    public async Task WaitAsync(TimeSpan timeout, TimeProvider time, CancellationToken cancellationToken)
    {
        using var either = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        Task nudged = _nudges.Reader.WaitToReadAsync(either.Token).AsTask();
        Task elapsed = Task.Delay(timeout, time, either.Token);
        await Task.WhenAny(nudged, elapsed);
        await either.CancelAsync();
        cancellationToken.ThrowIfCancellationRequested();
        _nudges.Reader.TryRead(out _);
    }
}
