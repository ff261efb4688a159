using ModelWatch.Checks.Evaluation;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Residuals;

/// <summary>
/// <c>residuals</c>. On every run, on the run's whole window (overlapping or not, each test at the run's budgeted α):
/// the bias t of the deployed coefficients (every row, including the baseline's own uncertainty), Brown–Forsythe and
/// the kurtosis-adjusted variance ratio for spread, Kolmogorov–Smirnov and Anderson–Darling for the distribution of
/// the standardized deployed errors against the reference residual sample (reservoir rows), Koenker's Breusch–Pagan on
/// the refit's residuals, and serial correlation of the deployed errors in row order. Also on every run, on the rows
/// new since the previous run: the bias and variance CUSUMs (<see cref="ResidualCusums"/>).
/// </summary>
public sealed class ResidualsCheck : IModelCheck
{
    /// <summary>Bias floor in reference residual SDs.</summary>
    public static readonly CheckSetting BiasFloor = new() { Check = CheckNames.Residuals, Name = "bias_floor", Default = 0.25, Minimum = 0, Maximum = 100, Description = "smallest mean error, in reference residual SDs, that pages (common practice)" };

    /// <summary>Variance ratio below which a spread change is practical.</summary>
    public static readonly CheckSetting SpreadRatioLow = new() { Check = CheckNames.Residuals, Name = "spread_ratio_low", Default = 0.8, Minimum = 0, Maximum = 1, Description = "residual variance ratio below which a change of spread is practical (common practice)" };

    /// <summary>Variance ratio above which a spread change is practical.</summary>
    public static readonly CheckSetting SpreadRatioHigh = new() { Check = CheckNames.Residuals, Name = "spread_ratio_high", Default = 1.25, Minimum = 1, Maximum = 1000, Description = "residual variance ratio above which a change of spread is practical (common practice)" };

    /// <summary>Kolmogorov–Smirnov distance floor.</summary>
    public static readonly CheckSetting KsFloor = new() { Check = CheckNames.Residuals, Name = "ks_floor", Default = 0.10, Minimum = 0, Maximum = 1, Description = "smallest Kolmogorov–Smirnov distance of the residual distribution that pages (common practice)" };

    /// <summary>Whether rows arrive in time order.</summary>
    public static readonly CheckSetting TimeOrdered = new() { Check = CheckNames.Residuals, Name = "time_ordered", Kind = SettingKind.Flag, Default = 1, Description = "rows are in time order, so serial correlation is tested (rows are read ordered by the time column)" };

    /// <summary>Rows for Durbin–Watson.</summary>
    public static readonly CheckSetting SerialCorrelationMinimumRows = new() { Check = CheckNames.Residuals, Name = "serial_correlation_minimum_rows", Kind = SettingKind.WholeNumber, Default = 50, Minimum = 10, Maximum = 1_000_000, Description = "time-ordered rows needed for Durbin–Watson (common practice)" };

    /// <summary>Rows beyond which Ljung–Box replaces Durbin–Watson.</summary>
    public static readonly CheckSetting LjungBoxMinimumRows = new() { Check = CheckNames.Residuals, Name = "ljung_box_minimum_rows", Kind = SettingKind.WholeNumber, Default = 100, Minimum = 10, Maximum = 1_000_000, Description = "rows beyond which Ljung–Box replaces Durbin–Watson (common practice)" };

    private ResidualsCheck()
    {
    }

    /// <summary>The registered instance.</summary>
    public static ResidualsCheck Instance { get; } = new();

    /// <inheritdoc />
    public string Name => CheckNames.Residuals;

    /// <inheritdoc />
    public IReadOnlyList<CheckSetting> Settings { get; } = [BiasFloor, SpreadRatioLow, SpreadRatioHigh, KsFloor, TimeOrdered, SerialCorrelationMinimumRows, LjungBoxMinimumRows];

    /// <inheritdoc />
    public IReadOnlyList<AlarmChannel> Channels { get; } =
    [
        new("residuals.bias", "bias t of the deployed errors on the window, every run"),
        new("residuals.spread", "Brown–Forsythe and the variance ratio on the window, every run (half each)"),
        new("residuals.distribution", "Kolmogorov–Smirnov of the standardized errors on the window, every run"),
        new("residuals.heteroscedasticity", "Koenker's Breusch–Pagan on the window, every run"),
        new("residuals.serial_correlation", "Ljung–Box on the window, every run"),
        new("residuals.bias_cusum", "Page CUSUM of the bias of the rows new since the previous run"),
        new("residuals.variance_cusum", "Page CUSUM of the variance of the rows new since the previous run"),
    ];

    /// <inheritdoc />
    public RunbookEntry Runbook { get; } = new(
        CheckNames.Residuals,
        "The errors of the deployed model have changed shape: a bias, a new spread, a different distribution, variance that depends on the features, or errors that follow each other in time. A CUSUM alert means a shift has persisted over the newest rows of one or more runs.",
        "Compare the residual distribution of the baseline with the window in the evidence report; look at the bias and spread findings' values; check the outcome's measurement (a sensor, a unit, a time zone) for a recent change.",
        "A bias with unchanged coefficients often means the outcome's measurement moved: fix the measurement, not the model. A new spread means predictions are less certain than advertised; tell the consumers of the predictions.");

    /// <inheritdoc />
    public CheckResult Run(CheckInput input)
    {
        ArgumentNullException.ThrowIfNull(input);
        CheckState state = input.CurrentState;
        (IReadOnlyList<Finding> sequential, ResidualsState memory) = ResidualCusums.Step(input, state.Read<ResidualsState>());
        var findings = new List<Finding>(sequential)
        {
            ResidualLevelAndSpread.Bias(input),
            ResidualLevelAndSpread.Spread(input),
            ResidualLevelAndSpread.VarianceRatio(input),
            ResidualShape.Distribution(input),
            ResidualShape.Tails(input),
            ResidualShape.Heteroscedasticity(input),
            ResidualShape.Serial(input),
        };
        return new CheckResult { Check = Name, State = state.With(memory), Findings = findings };
    }
}
