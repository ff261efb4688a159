using System.Diagnostics;
using System.Text;

namespace ModelWatch.Cli.Tests.Daemon;

/// <summary>
/// The built <c>modelwatch</c> executable run as its own process, with an environment of the test's choosing (so tests
/// that set variables do not share them), exactly as an operator or systemd would start it.
/// </summary>
internal sealed class ModelWatchProcess : IDisposable
{
    private readonly Process _process;
    private readonly StringBuilder _output = new();
    private readonly StringBuilder _error = new();

    private ModelWatchProcess(Process process)
    {
        _process = process;
        process.OutputDataReceived += (_, e) => Append(_output, e.Data);
        process.ErrorDataReceived += (_, e) => Append(_error, e.Data);
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
    }

    public string Output
    {
        get
        {
            lock (_output)
            {
                return _output.ToString();
            }
        }
    }

    public string Error
    {
        get
        {
            lock (_error)
            {
                return _error.ToString();
            }
        }
    }

    public int Id => _process.Id;

    /// <summary>Starts <c>modelwatch ARGS</c> in <paramref name="workingDirectory"/> with only the given variables beside PATH and HOME.</summary>
    public static ModelWatchProcess Start(IReadOnlyDictionary<string, string> environment, string workingDirectory, params string[] args)
    {
        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        start.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "modelwatch.dll"));
        foreach (string arg in args)
        {
            start.ArgumentList.Add(arg);
        }

        start.Environment.Clear();
        foreach (string keep in (string[])["PATH", "HOME", "DOTNET_ROOT", "TMPDIR"])
        {
            if (Environment.GetEnvironmentVariable(keep) is { } value)
            {
                start.Environment[keep] = value;
            }
        }

        foreach ((string key, string value) in environment)
        {
            start.Environment[key] = value;
        }

        return new ModelWatchProcess(Process.Start(start)!);
    }

    /// <summary>Waits for the exit code.</summary>
    public async Task<int> ExitCodeAsync(TimeSpan limit)
    {
        using var timeout = new CancellationTokenSource(limit);
        await _process.WaitForExitAsync(timeout.Token);
        _process.WaitForExit();
        return _process.ExitCode;
    }

    /// <summary>Sends SIGTERM, as systemd's stop does.</summary>
    public void Terminate()
    {
        using Process kill = Process.Start("kill", ["-TERM", _process.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)])!;
        kill.WaitForExit();
    }

    public void Dispose()
    {
        if (!_process.HasExited)
        {
            _process.Kill(entireProcessTree: true);
        }

        _process.Dispose();
    }

    private static void Append(StringBuilder into, string? line)
    {
        if (line is null)
        {
            return;
        }

        lock (into)
        {
            into.AppendLine(line);
        }
    }
}
