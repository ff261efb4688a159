namespace ModelWatch.Daemon.Telemetry;

/// <summary>The latest per-model values behind the observable gauges; NaN where a run did not produce one.</summary>
/// <param name="RmseRatio">Deployed RMSE over the baseline residual SD.</param>
/// <param name="ConditionNumber">Scaled condition number of the window's design.</param>
/// <param name="MaxCoefficientZ">Largest |z| of a coefficient against the baseline.</param>
/// <param name="MaxPsi">Largest population stability index over the features.</param>
/// <param name="OpenWarnings">Unresolved warning alerts.</param>
/// <param name="OpenCriticals">Unresolved critical alerts.</param>
public sealed record ModelGaugeValues(double RmseRatio, double ConditionNumber, double MaxCoefficientZ, double MaxPsi, int OpenWarnings, int OpenCriticals);
