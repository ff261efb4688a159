using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>How the daemon claims and runs models (configuration section <c>Daemon</c>).</summary>
public sealed class DaemonOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Daemon";

    /// <summary>Identifies this replica in leases and runs. Default: host name and process id.</summary>
    [Required]
    [MinLength(1)]
    public string WorkerId { get; set; } = $"{Environment.MachineName}-{Environment.ProcessId}";

    /// <summary>Models run at once by this replica. Default 2.</summary>
    [Range(1, 64)]
    public int Concurrency { get; set; } = 2;

    /// <summary>How often the daemon looks for due models. Default 15 s.</summary>
    [Range(typeof(TimeSpan), "00:00:01", "01:00:00")]
    public TimeSpan PollInterval { get; set; } = TimeSpan.FromSeconds(15);

    /// <summary>How long a claim on a model lasts before another replica may take it over. Default 10 min.</summary>
    [Range(typeof(TimeSpan), "00:00:05", "1.00:00:00")]
    public TimeSpan LeaseDuration { get; set; } = TimeSpan.FromMinutes(10);

    /// <summary>Apply pending migrations at start. Default true.</summary>
    public bool MigrateOnStart { get; set; } = true;

    /// <summary>What to do with slots missed while no replica ran. Default <see cref="MissedSlotPolicy.LatestOnly"/>.</summary>
    public MissedSlotPolicy MissedSlots { get; set; } = MissedSlotPolicy.LatestOnly;

    /// <summary>Under <see cref="MissedSlotPolicy.CatchUp"/>, the most missed slots run per model. Default 24.</summary>
    [Range(1, 10_000)]
    public int MaxCatchUpSlots { get; set; } = 24;

    /// <summary>Longest wait between retries while the state database is unreachable. Default 2 min.</summary>
    [Range(typeof(TimeSpan), "00:00:01", "01:00:00")]
    public TimeSpan MaxBackoff { get; set; } = TimeSpan.FromMinutes(2);

    /// <summary>Time allowed for in-flight runs to finish on SIGTERM before they are abandoned. Default 30 s.</summary>
    [Range(typeof(TimeSpan), "00:00:01", "00:10:00")]
    public TimeSpan ShutdownTimeout { get; set; } = TimeSpan.FromSeconds(30);

    /// <summary>
    /// Memory the parsed baselines kept between runs may take, in MiB (estimated from their samples). Default 512:
    /// about 500 models with full 5,000-row reference samples over ten features, or thousands of smaller ones. Past it
    /// the least recently used baselines are dropped and read again at their model's next run.
    /// </summary>
    [Range(1, 1_048_576)]
    public int BaselineCacheMegabytes { get; set; } = 512;
}
