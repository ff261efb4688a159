namespace ModelWatch.Daemon.Tests.Http;

/// <summary>
/// A test that needs the Prometheus server binary (Debian's <c>prometheus</c> package, which <c>.ci/run</c> installs);
/// skipped, with the reason, on a machine without it.
/// </summary>
public sealed class PrometheusFactAttribute : FactAttribute
{
    /// <summary>Where Debian installs the server.</summary>
    public const string Binary = "/usr/bin/prometheus";

    /// <summary>Skips the test when the binary is missing.</summary>
    public PrometheusFactAttribute()
    {
        if (!File.Exists(Binary))
        {
            Skip = $"needs the Prometheus server at {Binary} (apt-get install prometheus; .ci/run installs it)";
        }
    }
}
