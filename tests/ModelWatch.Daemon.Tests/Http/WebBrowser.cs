using ModelWatch.Testing.Browser;

namespace ModelWatch.Daemon.Tests.Http;

/// <summary>
/// Debian's Chromium, headless, as CI runs it (as root, hence <c>--no-sandbox</c>; no background networking). Every
/// host name resolves to the given loopback port (or to nothing), so a page that tried to load anything from another
/// origin would either fail or show up at the test's server with a foreign Host header.
/// </summary>
internal static class WebBrowser
{
    /// <summary>The DOM of <paramref name="url"/> after load, at the given window width.</summary>
    public static async Task<string> DumpDomAsync(string url, int width, int? everyHostTo = null) =>
        (await RunAsync(everyHostTo, "--dump-dom", "--virtual-time-budget=5000", $"--window-size={width},900", url)).Output;

    /// <summary>A full-height screenshot of <paramref name="url"/> at the given width.</summary>
    public static async Task ScreenshotAsync(string url, string png, int width, int height)
    {
        (_, string error) = await RunAsync(null, $"--screenshot={png}", $"--window-size={width},{height}", "--hide-scrollbars", url);
        Assert.True(File.Exists(png) && new FileInfo(png).Length > 0, "chromium wrote no screenshot: " + error);
    }

    private static Task<(string Output, string Error)> RunAsync(int? everyHostTo, params string[] args) =>
        ChromiumRun.RunAsync(ChromiumFactAttribute.Binary,
            [everyHostTo is { } port ? $"--host-resolver-rules=MAP * 127.0.0.1:{port}" : "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1", .. args]);
}
