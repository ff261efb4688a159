namespace ModelWatch.Daemon.Notifications;

/// <summary>One attempt to deliver a notification, recorded whatever its outcome.</summary>
/// <param name="Target">The target's name.</param>
/// <param name="AlertId">The alert the notification is about.</param>
/// <param name="Attempt">1 for the first try.</param>
/// <param name="At">When the attempt was made.</param>
/// <param name="StatusCode">HTTP status, or null when no response came.</param>
/// <param name="Error">What went wrong, or null on success.</param>
public sealed record DeliveryAttempt(string Target, long AlertId, int Attempt, DateTimeOffset At, int? StatusCode, string? Error)
{
    /// <summary>True when the target answered 2xx.</summary>
    public bool Succeeded => Error is null;
}
