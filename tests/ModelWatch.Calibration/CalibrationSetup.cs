namespace ModelWatch.Calibration;

/// <summary>
/// The simulated model: 5 independent standard-normal features, σ = 1, <see cref="RowsPerHour"/> rows every hour, and
/// a baseline fitted on the 30 days before monitoring starts. Every trial draws its own baseline and rows from a seed
/// derived from the stream and the trial, so every figure is reproducible.
/// </summary>
/// <param name="RowsPerHour">Rows arriving every hour.</param>
/// <param name="BaselineDays">Days of rows the baseline is fitted on.</param>
/// <param name="Features">Features of the model.</param>
public sealed record CalibrationSetup(int RowsPerHour = 60, int BaselineDays = 30, int Features = 5)
{
    /// <summary>Seed of trial <paramref name="trial"/> in the simulation identified by <paramref name="stream"/>.</summary>
    public static int Seed(int stream, int trial) => (stream * 1_000_003) + trial;

    /// <summary>A trial's model and its baseline.</summary>
    public (SyntheticModel Model, Checks.Summaries.BaselineReference Baseline) Trial(int stream, int trial)
    {
        var model = new SyntheticModel(Seed(stream, trial), Features);
        return (model, model.Baseline(BaselineDays * 24 * RowsPerHour, seed: trial));
    }
}
