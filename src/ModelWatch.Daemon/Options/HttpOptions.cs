using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Daemon.Options;

/// <summary>
/// The daemon's HTTP endpoint (configuration section <c>Http</c>): <c>/healthz/live</c>, <c>/healthz/ready</c>, and
/// <c>/metrics</c> when <c>Telemetry:PrometheusEnabled</c>. Off unless enabled; loopback unless told otherwise.
/// </summary>
public sealed class HttpOptions
{
    /// <summary>The configuration section.</summary>
    public const string Section = "Http";

    /// <summary>Serve the endpoint. Default false.</summary>
    public bool Enabled { get; set; }

    /// <summary>
    /// Where to listen, one or more <c>http://ADDRESS:PORT</c> separated by <c>;</c>. ADDRESS is an IP address
    /// (<c>0.0.0.0</c> or <c>[::]</c> for every interface, for example inside a container), <c>localhost</c>, or <c>*</c>.
    /// Default <c>http://127.0.0.1:9464</c>.
    /// </summary>
    [Required]
    public string Urls { get; set; } = "http://127.0.0.1:9464";

    /// <summary>The loop counts as dead when it has not completed a cycle for this many poll intervals. Default 4.</summary>
    [Range(2, 100)]
    public int LivenessPollIntervals { get; set; } = 4;
}
