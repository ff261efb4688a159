using System.Diagnostics;

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

    private static async Task<(string Output, string Error)> RunAsync(int? everyHostTo, params string[] args)
    {
        string profile = Directory.CreateTempSubdirectory("mw-chromium-").FullName;
        try
        {
            var start = new ProcessStartInfo(ChromiumFactAttribute.Binary) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
            foreach (string flag in (string[])["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking",
                         "--no-first-run", "--disable-component-update", "--disable-sync", everyHostTo is { } port ? $"--host-resolver-rules=MAP * 127.0.0.1:{port}" : "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
                         "--user-data-dir=" + profile])
            {
                start.ArgumentList.Add(flag);
            }

            foreach (string arg in args)
            {
                start.ArgumentList.Add(arg);
            }

            using Process process = Process.Start(start)!;
            Task<string> output = process.StandardOutput.ReadToEndAsync();
            Task<string> error = process.StandardError.ReadToEndAsync();

            // A hung browser must not hang the test run; the limit is a safety net, not an assertion about speed.
            using var limit = new CancellationTokenSource(TimeSpan.FromMinutes(2));
            try
            {
                await process.WaitForExitAsync(limit.Token);
            }
            catch (OperationCanceledException)
            {
                process.Kill(entireProcessTree: true);
                throw new TimeoutException("chromium did not finish within two minutes");
            }

            Assert.True(process.ExitCode == 0, $"chromium exited {process.ExitCode}: {await error}");
            return (await output, await error);
        }
        finally
        {
            Directory.Delete(profile, recursive: true);
        }
    }
}
