using Microsoft.Extensions.Logging;

namespace ModelWatch.Cli.Demo;

/// <summary>A logger of <see cref="DemoLoggerProvider"/>: warnings and above.</summary>
internal sealed class DemoLogger(DemoLoggerProvider owner) : ILogger
{
    public IDisposable? BeginScope<TState>(TState state)
        where TState : notnull => null;

    public bool IsEnabled(LogLevel logLevel) => logLevel >= LogLevel.Warning;

    public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter)
    {
        ArgumentNullException.ThrowIfNull(formatter);
        if (IsEnabled(logLevel))
        {
            owner.Write(logLevel, formatter(state, exception) + (exception is null ? string.Empty : " (" + exception.Message + ")"));
        }
    }
}
