using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>Webhook targets by name and how the queue of notifications is drained (configuration section <c>Notifications</c>).</summary>
public sealed class NotificationOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Notifications";

    /// <summary>Targets by name. Default: none.</summary>
    public Dictionary<string, NotificationTargetOptions> Targets { get; set; } = new(StringComparer.Ordinal);

    /// <summary>
    /// How often the dispatcher looks for queued notifications. Default 5 s. Transitions this process records wake it
    /// at once; this bounds the delay for those written elsewhere (another replica's crash, <c>check --record</c>,
    /// an operator's <c>alerts ack</c>).
    /// </summary>
    [Range(typeof(TimeSpan), "00:00:01", "01:00:00")]
    public TimeSpan PollInterval { get; set; } = TimeSpan.FromSeconds(5);

    /// <summary>
    /// How long a replica's claim on a notification lasts; after it, another replica may send it again. Default 15 min,
    /// above the longest delivery the target defaults allow (5 attempts of 10 s with back-off).
    /// </summary>
    [Range(typeof(TimeSpan), "00:00:10", "1.00:00:00")]
    public TimeSpan LeaseDuration { get; set; } = TimeSpan.FromMinutes(15);
}
