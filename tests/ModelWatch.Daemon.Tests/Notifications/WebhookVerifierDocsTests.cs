using System.Diagnostics;
using System.Globalization;
using ModelWatch.Daemon.Notifications;
using ModelWatch.Daemon.Options;
using ModelWatch.Testing.Repository;

namespace ModelWatch.Daemon.Tests.Notifications;

/// <summary>The verifier printed in docs/operations.md accepts a real delivery and refuses a replay or a forgery.</summary>
public sealed class WebhookVerifierDocsTests
{
    private const string Secret = "a-shared-secret-of-some-length";

    [Fact]
    public async Task The_documented_verifier_accepts_a_real_delivery_and_refuses_a_late_replay_and_a_changed_body()
    {
        using var receiver = new LoopbackReceiver(200);
        using var http = new HttpClient();
        var sender = new WebhookSender(http, TimeProvider.System);
        var alert = new ModelWatch.Daemon.Alerts.AlertEvent(7, "opened", "courier-eta", "source", null, "critical", "open", "failed_runs", 3, 3, "3 runs in a row failed", TimeProvider.System.GetUtcNow());
        await sender.DeliverAsync("pager", new NotificationTargetOptions { Url = receiver.Url, Secret = Secret }, 7, (attempt, at) => NotificationPayload.Create(alert, at, attempt), CancellationToken.None);
        Assert.True(receiver.Received.TryDequeue(out var received));
        long sent = long.Parse(received.Timestamp!, CultureInfo.InvariantCulture);

        string folder = Directory.CreateTempSubdirectory("mw-verifier-").FullName;
        try
        {
            string script = Path.Combine(folder, "verify.py");
            File.WriteAllText(script, DocumentedVerifier() + """

                import pathlib
                import sys

                body = pathlib.Path(sys.argv[1]).read_bytes()
                print("valid" if verify(sys.argv[2].encode(), body, sys.argv[3], sys.argv[4], now=float(sys.argv[5])) else "invalid")
                """);
            string body = Path.Combine(folder, "body.json");
            File.WriteAllBytes(body, received.Body);
            string changed = Path.Combine(folder, "changed.json");
            File.WriteAllBytes(changed, [.. received.Body.Select(b => b == (byte)'3' ? (byte)'4' : b)]);

            Assert.Equal("valid", await RunAsync(script, body, Secret, received.Timestamp!, received.Signature!, sent + 10));
            Assert.Equal("invalid", await RunAsync(script, body, Secret, received.Timestamp!, received.Signature!, sent + 301));
            Assert.Equal("invalid", await RunAsync(script, changed, Secret, received.Timestamp!, received.Signature!, sent));
            Assert.Equal("invalid", await RunAsync(script, body, Secret, (sent + 60).ToString(CultureInfo.InvariantCulture), received.Signature!, sent + 60));
            Assert.Equal("invalid", await RunAsync(script, body, "another-secret-entirely", received.Timestamp!, received.Signature!, sent));
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    private static string DocumentedVerifier() => RepositoryFiles.CodeBlock("operations.md", "### Verifying a webhook", "python");

    private static async Task<string> RunAsync(string script, params object[] args)
    {
        var start = new ProcessStartInfo("python3") { RedirectStandardOutput = true, RedirectStandardError = true };
        start.ArgumentList.Add(script);
        foreach (object arg in args)
        {
            start.ArgumentList.Add(Convert.ToString(arg, CultureInfo.InvariantCulture)!);
        }

        using Process process = Process.Start(start)!;
        string output = await process.StandardOutput.ReadToEndAsync();
        string error = await process.StandardError.ReadToEndAsync();
        await process.WaitForExitAsync();
        Assert.True(process.ExitCode == 0, error);
        return output.Trim();
    }
}
