namespace ModelWatch.Daemon.Fleet;

/// <summary>One model's standing, as <c>modelwatch status</c> and the fleet page show it.</summary>
public sealed class ModelStatus
{
    /// <summary>Model key.</summary>
    public string Key { get; set; } = string.Empty;

    /// <summary>False for a model that is registered but not scheduled.</summary>
    public bool Enabled { get; set; }

    /// <summary>The slot of the newest finished run (UTC), or null before the first run.</summary>
    public DateTime? LastRunAt { get; set; }

    /// <summary><c>ok</c>, <c>failed</c> or <c>skipped</c>, or null before the first run.</summary>
    public string? LastStatus { get; set; }

    /// <summary>The worst severity among the newest run's findings (<c>ok</c>, <c>warning</c>, <c>critical</c>), or null when it has none.</summary>
    public string? WorstSeverity { get; set; }

    /// <summary>Unresolved (open or acknowledged) warning alerts.</summary>
    public int OpenWarning { get; set; }

    /// <summary>Unresolved (open or acknowledged) critical alerts.</summary>
    public int OpenCritical { get; set; }

    /// <summary>The end of the latest quiet period in force for the whole model or one of its checks, or null.</summary>
    public DateTime? QuietUntil { get; set; }

    /// <summary>How many quiet periods are in force.</summary>
    public int QuietPeriods { get; set; }

    /// <summary>The baseline version the model is watched against (the active one, else the newest), or null.</summary>
    public int? BaselineVersion { get; set; }

    /// <summary>When that baseline was created.</summary>
    public DateTime? BaselineCreatedAt { get; set; }

    /// <summary>Failed runs since the newest run that read its window (0 when the last run succeeded).</summary>
    public int FailingRuns { get; set; }

    /// <summary>The baseline's age in whole days at <paramref name="now"/>, or null without a baseline.</summary>
    public int? BaselineAgeDays(DateTimeOffset now) =>
        BaselineCreatedAt is { } created ? (int)Math.Floor((now - new DateTimeOffset(DateTime.SpecifyKind(created, DateTimeKind.Utc))).TotalDays) : null;

    /// <summary>True when the model has an unresolved alert at <paramref name="severity"/> or above (<c>warning</c> or <c>critical</c>).</summary>
    public bool HasOpenAlertAtLeast(string severity) =>
        severity == "critical" ? OpenCritical > 0 : OpenWarning + OpenCritical > 0;
}
