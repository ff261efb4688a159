using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>The health endpoint (configuration section <c>Health</c>): off unless enabled; loopback unless told otherwise.</summary>
public sealed class HealthOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Health";

    /// <summary>Serve <c>/healthz/live</c> and <c>/healthz/ready</c>. Default false.</summary>
    public bool Enabled { get; set; }

    /// <summary>Address to bind. Default 127.0.0.1; use <c>*</c> for all interfaces (for example inside a container).</summary>
    [Required]
    public string Address { get; set; } = "127.0.0.1";

    /// <summary>Port. Default 8081.</summary>
    [Range(1, 65535)]
    public int Port { get; set; } = 8081;

    /// <summary>The loop counts as dead when it has not completed a cycle for this many poll intervals. Default 4.</summary>
    [Range(2, 100)]
    public int LivenessPollIntervals { get; set; } = 4;
}
