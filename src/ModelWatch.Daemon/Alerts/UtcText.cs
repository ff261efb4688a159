using System.Globalization;

namespace ModelWatch.Daemon.Alerts;

/// <summary>A stored UTC time as the sentences of alert and quiet-period changes print it (RFC 3339 with <c>Z</c>).</summary>
internal static class UtcText
{
    public static string Of(DateTime? at) =>
        at is { } t ? DateTime.SpecifyKind(t, DateTimeKind.Utc).ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture) : "an unknown time";
}
