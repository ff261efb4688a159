using System.Collections.Concurrent;
using Microsoft.Extensions.Logging;

namespace ModelWatch.Daemon.Tests.Support;

/// <summary>Collects log records in memory so tests can assert on event ids.</summary>
internal sealed class CapturedLogs : ILoggerProvider
{
    public ConcurrentQueue<(int EventId, LogLevel Level, string Message)> Records { get; } = new();

    public ILogger CreateLogger(string categoryName) => new Logger(this);

    public void Dispose()
    {
    }

    public int Count(int eventId) => Records.Count(r => r.EventId == eventId);

    private sealed class Logger(CapturedLogs owner) : ILogger
    {
        public IDisposable? BeginScope<TState>(TState state)
            where TState : notnull => null;

        public bool IsEnabled(LogLevel logLevel) => true;

        public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter) =>
            owner.Records.Enqueue((eventId.Id, logLevel, formatter(state, exception) + (exception is null ? string.Empty : " " + exception.Message)));
    }
}
