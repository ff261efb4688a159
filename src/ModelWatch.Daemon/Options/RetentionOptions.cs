using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>Pruning of old runs and findings (configuration section <c>Retention</c>); alerts and baselines are kept.</summary>
public sealed class RetentionOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Retention";

    /// <summary>Runs (and their findings) older than this are deleted. Default 180 days.</summary>
    [Range(typeof(TimeSpan), "1.00:00:00", "3650.00:00:00")]
    public TimeSpan RunMaxAge { get; set; } = TimeSpan.FromDays(180);

    /// <summary>Rows deleted per statement, so pruning never holds long locks. Default 500.</summary>
    [Range(1, 100_000)]
    public int BatchSize { get; set; } = 500;

    /// <summary>How often pruning runs. Default 1 h.</summary>
    [Range(typeof(TimeSpan), "00:01:00", "7.00:00:00")]
    public TimeSpan Interval { get; set; } = TimeSpan.FromHours(1);
}
