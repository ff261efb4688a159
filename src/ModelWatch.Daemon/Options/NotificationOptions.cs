namespace ModelWatch.Daemon.Options;

/// <summary>Webhook targets by name (configuration section <c>Notifications</c>). Default: none.</summary>
public sealed class NotificationOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Notifications";

    /// <summary>Targets by name.</summary>
    public Dictionary<string, NotificationTargetOptions> Targets { get; set; } = new(StringComparer.Ordinal);
}
