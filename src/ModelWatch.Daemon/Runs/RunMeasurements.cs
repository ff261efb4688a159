namespace ModelWatch.Daemon.Runs;

/// <summary>What one run measured for the per-model gauges; NaN where the run did not measure it.</summary>
/// <param name="RmseRatio">Deployed RMSE on the window over the baseline residual SD.</param>
/// <param name="ConditionNumber">Scaled condition number of the window's design.</param>
/// <param name="MaxCoefficientZ">Largest |z| of a coefficient against the baseline.</param>
/// <param name="MaxPsi">Largest population stability index over the features.</param>
public sealed record RunMeasurements(double RmseRatio, double ConditionNumber, double MaxCoefficientZ, double MaxPsi)
{
    /// <summary>Nothing measured: the values of a run that measured nothing.</summary>
    public static RunMeasurements None { get; } = new(double.NaN, double.NaN, double.NaN, double.NaN);
}
