using System.Globalization;
using Serilog.Core;
using Serilog.Events;

namespace ModelWatch.Daemon.Hosting;

/// <summary>Adds the event's time in UTC with a <c>Z</c>, so console logs read the same on every host whatever its time zone.</summary>
public sealed class UtcTimestampEnricher : ILogEventEnricher
{
    /// <summary>The property the console template prints.</summary>
    public const string Property = "UtcTime";

    /// <inheritdoc />
    public void Enrich(LogEvent logEvent, ILogEventPropertyFactory propertyFactory)
    {
        ArgumentNullException.ThrowIfNull(logEvent);
        ArgumentNullException.ThrowIfNull(propertyFactory);
        string text = logEvent.Timestamp.UtcDateTime.ToString("yyyy-MM-ddTHH:mm:ss.fffZ", CultureInfo.InvariantCulture);
        logEvent.AddPropertyIfAbsent(propertyFactory.CreateProperty(Property, text));
    }
}
