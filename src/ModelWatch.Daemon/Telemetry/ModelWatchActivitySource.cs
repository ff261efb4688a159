using System.Diagnostics;

namespace ModelWatch.Daemon.Telemetry;

/// <summary>The activity source for run traces: one trace per run with read, fit, checks and persist spans.</summary>
public static class ModelWatchActivitySource
{
    /// <summary>The shared source (activity sources are cheap to keep and must be created once).</summary>
    public static ActivitySource Instance { get; } = new(TelemetryNames.Source);
}
