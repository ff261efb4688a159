using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>One webhook target (<c>Notifications:Targets:&lt;name&gt;</c>), referenced by name from a spec's <c>notify</c>.</summary>
public sealed class NotificationTargetOptions
{
    /// <summary>Where to POST the JSON payload.</summary>
    [Required]
    [Url]
    public string Url { get; set; } = string.Empty;

    /// <summary>Shared secret for the HMAC-SHA256 signature header. Required: unsigned notifications are not sent.</summary>
    [Required]
    [MinLength(16)]
    public string Secret { get; set; } = string.Empty;

    /// <summary>Lowest severity sent to this target: <c>warning</c> or <c>critical</c>. Default warning.</summary>
    [RegularExpression("^(warning|critical)$")]
    public string MinimumSeverity { get; set; } = "warning";

    /// <summary>Delivery attempts before giving up. Default 5.</summary>
    [Range(1, 20)]
    public int MaxAttempts { get; set; } = 5;

    /// <summary>Wait before the first retry; doubled each time, with jitter. Default 2 s.</summary>
    [Range(typeof(TimeSpan), "00:00:00.010", "00:10:00")]
    public TimeSpan InitialBackoff { get; set; } = TimeSpan.FromSeconds(2);

    /// <summary>Timeout of one attempt. Default 10 s.</summary>
    [Range(typeof(TimeSpan), "00:00:01", "00:05:00")]
    public TimeSpan Timeout { get; set; } = TimeSpan.FromSeconds(10);
}
