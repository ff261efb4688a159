using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Abstractions;
using ModelWatch.Daemon.Alerts;

namespace ModelWatch.Cli.Demo;

/// <summary>
/// The daemon's logs during the demo: warnings and errors only, on standard error, so the demo's own progress and
/// alert lines stay readable while a failing run still shows.
/// </summary>
internal sealed class DemoLoggerProvider(TextWriter error) : ILoggerProvider
{
    private readonly Lock _gate = new();

    // Alert transitions are printed by the demo itself, from the alert history; their log records would say it twice.
    public ILogger CreateLogger(string categoryName) =>
        categoryName == typeof(AlertEventLogger).FullName ? NullLogger.Instance : new DemoLogger(this);

    public void Dispose()
    {
    }

    internal void Write(LogLevel level, string message)
    {
        lock (_gate)
        {
            error.WriteLine($"  daemon {level.ToString().ToLowerInvariant()}: {message}");
        }
    }
}
