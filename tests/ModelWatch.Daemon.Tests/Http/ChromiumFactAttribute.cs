namespace ModelWatch.Daemon.Tests.Http;

/// <summary>
/// A test that renders pages in Debian's headless Chromium (which <c>.ci/run</c> installs); skipped, with the reason,
/// on a machine without it.
/// </summary>
public sealed class ChromiumFactAttribute : FactAttribute
{
    /// <summary>Where Debian installs the browser.</summary>
    public const string Binary = "/usr/bin/chromium";

    /// <summary>Skips the test when the browser is missing.</summary>
    public ChromiumFactAttribute()
    {
        if (!File.Exists(Binary))
        {
            Skip = $"needs headless Chromium at {Binary} (apt-get install chromium; .ci/run installs it)";
        }
    }
}
