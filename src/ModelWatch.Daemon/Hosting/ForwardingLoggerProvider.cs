using Microsoft.Extensions.Logging;

namespace ModelWatch.Daemon.Hosting;

/// <summary>Hands records on to another logger factory, so alert events also reach the ordinary (Serilog) log.</summary>
internal sealed class ForwardingLoggerProvider(ILoggerFactory target) : ILoggerProvider
{
    public ILogger CreateLogger(string categoryName) => target.CreateLogger(categoryName);

    public void Dispose()
    {
        // The target factory belongs to the host.
    }
}
