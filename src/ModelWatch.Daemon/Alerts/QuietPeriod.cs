namespace ModelWatch.Daemon.Alerts;

/// <summary>
/// A quiet period: notifications for a model (or one of its checks) are held until <see cref="Until"/> or until someone
/// ends it; runs and alerts go on, and every notification it holds is recorded as <c>held</c>.
/// </summary>
public sealed class QuietPeriod
{
    /// <summary>Its number.</summary>
    public long Id { get; set; }

    /// <summary>Model key.</summary>
    public string Model { get; set; } = string.Empty;

    /// <summary>The one check it quiets, or null for every check of the model.</summary>
    public string? Check { get; set; }

    /// <summary>When it ends by itself (UTC).</summary>
    public DateTime Until { get; set; }

    /// <summary>Why it was set.</summary>
    public string Reason { get; set; } = string.Empty;

    /// <summary>Who set it.</summary>
    public string CreatedBy { get; set; } = string.Empty;

    /// <summary>When it was set (UTC).</summary>
    public DateTime CreatedAt { get; set; }

    /// <summary>When someone ended it early (UTC), or null.</summary>
    public DateTime? EndedAt { get; set; }

    /// <summary>Who ended it early, or null.</summary>
    public string? EndedBy { get; set; }

    /// <summary>How many notifications it has held.</summary>
    public int Held { get; set; }

    /// <summary><c>active</c>, <c>ended</c> (by someone) or <c>expired</c> at <paramref name="now"/>.</summary>
    public string StateAt(DateTimeOffset now) =>
        EndedAt is not null ? "ended" : DateTime.SpecifyKind(Until, DateTimeKind.Utc) > now.UtcDateTime ? "active" : "expired";
}
