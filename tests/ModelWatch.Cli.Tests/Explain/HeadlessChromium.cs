using ModelWatch.Testing.Browser;

namespace ModelWatch.Cli.Tests.Explain;

/// <summary>
/// Debian's Chromium, run headless as the machine's CI runs it (as root, hence <c>--no-sandbox</c>; no background
/// networking, since the machine's network is closed). Missing Chromium fails the test with how to install it.
/// </summary>
internal static class HeadlessChromium
{
    private const string Binary = "/usr/bin/chromium";

    public static string Executable
    {
        get
        {
            Assert.True(File.Exists(Binary), $"{Binary} is missing: install Debian's chromium ('apt-get install -y chromium'; .ci/run installs it when missing)");
            return Binary;
        }
    }

    /// <summary>Loads a local file and returns the DOM after its inline scripts ran.</summary>
    public static async Task<string> DumpDomAsync(string htmlFile)
    {
        (string output, _) = await RunAsync("--dump-dom", new Uri(htmlFile).AbsoluteUri);
        return output;
    }

    /// <summary>Takes a screenshot of a local file at the given window size.</summary>
    public static async Task ScreenshotAsync(string htmlFile, string png, int width, int height)
    {
        (_, string error) = await RunAsync($"--screenshot={png}", $"--window-size={width},{height}", "--hide-scrollbars", new Uri(htmlFile).AbsoluteUri);
        Assert.True(File.Exists(png) && new FileInfo(png).Length > 0, "chromium wrote no screenshot: " + error);
    }

    private static Task<(string Output, string Error)> RunAsync(params string[] args) => ChromiumRun.RunAsync(Executable, args);
}
