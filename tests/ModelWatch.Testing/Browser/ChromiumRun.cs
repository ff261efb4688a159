using System.Diagnostics;
using Xunit;

namespace ModelWatch.Testing.Browser;

/// <summary>
/// One headless Chromium process as CI runs it: as root (hence <c>--no-sandbox</c>), with no background networking
/// (the machine's network is closed) and a throwaway profile. The callers add what they load and how.
/// </summary>
public static class ChromiumRun
{
    /// <summary>Runs <paramref name="binary"/> with the common flags and <paramref name="args"/>; asserts a clean exit.</summary>
    public static async Task<(string Output, string Error)> RunAsync(string binary, IEnumerable<string> args)
    {
        ArgumentNullException.ThrowIfNull(args);
        string profile = Directory.CreateTempSubdirectory("mw-chromium-").FullName;
        try
        {
            var start = new ProcessStartInfo(binary) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
            foreach (string flag in (string[])["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking",
                         "--no-first-run", "--disable-component-update", "--disable-sync", "--user-data-dir=" + profile])
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
