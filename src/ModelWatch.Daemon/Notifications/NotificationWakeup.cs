using System.Threading.Channels;
using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Daemon.Notifications;

/// <summary>
/// Alert transitions waiting to be delivered. Runs only enqueue (never wait on a target), so a slow or failing
/// webhook cannot delay monitoring; <see cref="NotificationDispatcher"/> drains the queue in the background.
/// </summary>
public sealed class NotificationOutbox
{
    private readonly Channel<(AlertEvent Event, IReadOnlyList<string> Targets)> _channel =
        Channel.CreateBounded<(AlertEvent, IReadOnlyList<string>)>(new BoundedChannelOptions(10_000) { FullMode = BoundedChannelFullMode.DropOldest });

    /// <summary>Queues a transition for the spec's notification targets.</summary>
    public void Enqueue(AlertEvent alert, IReadOnlyList<string> targets)
    {
        if (targets.Count > 0)
        {
            _channel.Writer.TryWrite((alert, targets));
        }
    }

    internal ChannelReader<(AlertEvent Event, IReadOnlyList<string> Targets)> Reader => _channel.Reader;
}
