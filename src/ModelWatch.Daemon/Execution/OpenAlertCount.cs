namespace ModelWatch.Daemon.Execution;

/// <summary>A model's unresolved alerts: by severity, and those of the <c>source</c> check.</summary>
/// <param name="Warnings">Unresolved warning alerts.</param>
/// <param name="Criticals">Unresolved critical alerts.</param>
/// <param name="Source">Unresolved alerts of the source check.</param>
internal readonly record struct OpenAlertCount(int Warnings, int Criticals, int Source);
