using System.ComponentModel.DataAnnotations;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// Every threshold the checks and the alert policy use, per model. Each default names its source
/// (methods.md section, a paper) or says "common practice"; docs/checks.md lists them all.
/// </summary>
public sealed record CheckThresholds
{
    /// <summary>False critical alerts a model may raise per year, spent across all alarm channels. Default 1 (issue 4).</summary>
    [Range(1e-6, 1000)]
    public double FalseAlarmsPerYear { get; init; } = 1.0;

    /// <summary>
    /// Alarm channels the budget is split over equally (methods.md §3.5.1). Default 11: Wald, Chow predictive, residual
    /// spread, residual distribution, heteroscedasticity, autocorrelation, PSI, feature KS, leverage, and the bias and
    /// variance CUSUMs.
    /// </summary>
    [Range(1, 100)]
    public int AlarmChannels { get; init; } = 11;

    /// <summary>How often the model runs. Default 1 hour (methods.md §3.4, hourly cadence).</summary>
    public TimeSpan Cadence { get; init; } = TimeSpan.FromHours(1);

    /// <summary>Length of the window each run reads. Default 24 hours (methods.md §3.5.2: daily fixed-sample tests).</summary>
    public TimeSpan WindowLength { get; init; } = TimeSpan.FromHours(24);

    /// <summary>Overrides the budgeted per-test α of the fixed-sample tests (used by calibration tests). Default none.</summary>
    public double? AlphaOverride { get; init; }

    /// <summary>Significance level of a warning, with no practical floor (methods.md §3.5.9). Default 0.01.</summary>
    [Range(1e-12, 0.5)]
    public double WarningAlpha { get; init; } = 0.01;

    /// <summary>Minimum usable rows; null means max(30, 10p) (methods.md §3.5.5).</summary>
    public int? MinimumRows { get; init; }

    /// <summary>Predictive impact floor <c>D = δᵀSδ/s²_ref</c> for coefficient drift (methods.md §2.6). Default 0.10.</summary>
    public double DriftImpactFloor { get; init; } = 0.10;

    /// <summary>Relative MSE growth floor of the deployed coefficients (methods.md §6.5). Default 0.10.</summary>
    public double MseGrowthFloor { get; init; } = 0.10;

    /// <summary>Bias floor in reference residual SDs (methods.md §3.5.3). Default 0.25.</summary>
    public double BiasFloor { get; init; } = 0.25;

    /// <summary>Variance ratio below which a variance change is practical (methods.md §3.5.3). Default 0.8.</summary>
    public double SpreadRatioLow { get; init; } = 0.8;

    /// <summary>Variance ratio above which a variance change is practical (methods.md §3.5.3). Default 1.25.</summary>
    public double SpreadRatioHigh { get; init; } = 1.25;

    /// <summary>Kolmogorov–Smirnov distance floor (methods.md §5.3, §7.2). Default 0.10.</summary>
    public double KsFloor { get; init; } = 0.10;

    /// <summary>PSI for a critical feature drift (common practice, methods.md §7.1). Default 0.25.</summary>
    public double PsiCritical { get; init; } = 0.25;

    /// <summary>PSI for a warning (common practice, methods.md §7.1). Default 0.10.</summary>
    public double PsiWarning { get; init; } = 0.10;

    /// <summary>Leverage-exceedance excess over the reference share (methods.md §7.3). Default 0.02.</summary>
    public double LeverageExcessFloor { get; init; } = 0.02;

    /// <summary>Absolute VIF alarm level (Marquardt 1970; methods.md §4.3). Default 10.</summary>
    public double VifAlarm { get; init; } = 10.0;

    /// <summary>VIF growth factor over baseline (methods.md §4.4). Default 2.</summary>
    public double VifRatio { get; init; } = 2.0;

    /// <summary>Scaled condition number alarm level (Belsley, Kuh &amp; Welsch 1980; methods.md §4.4). Default 100.</summary>
    public double ConditionAlarm { get; init; } = 100.0;

    /// <summary>Growth of log10 κ over baseline for an alarm (methods.md §4.4: ×3.2). Default 0.5.</summary>
    public double ConditionGrowthLog10 { get; init; } = 0.5;

    /// <summary>Condition index that marks a near-dependency (BKW 1980; methods.md §4.2). Default 30.</summary>
    public double DependencyIndex { get; init; } = 30.0;

    /// <summary>Variance-decomposition proportion that puts a coefficient in a near-dependency (BKW 1980). Default 0.5.</summary>
    public double DependencyProportion { get; init; } = 0.5;

    /// <summary>CUSUM reference value k (methods.md §3.2, for a 1σ design shift). Default 0.5.</summary>
    public double CusumReference { get; init; } = 0.5;

    /// <summary>CUSUM threshold h; null derives it from the budget by the ARL (methods.md §3.4).</summary>
    public double? CusumThreshold { get; init; }

    /// <summary>Windows looked back over for persistence (methods.md §3.5.4). Default 3.</summary>
    [Range(1, 20)]
    public int PersistenceWindows { get; init; } = 3;

    /// <summary>Critical windows among <see cref="PersistenceWindows"/> that open an alert (methods.md §3.5.4). Default 2.</summary>
    [Range(1, 20)]
    public int PersistenceRequired { get; init; } = 2;

    /// <summary>
    /// Also open <c>warning</c> alerts, when warnings persist: <see cref="PersistenceRequired"/> of the last
    /// <see cref="PersistenceWindows"/> evaluated windows at warning or above. Such an alert escalates to critical on
    /// critical evidence. Default false: a warning is a single test at <see cref="WarningAlpha"/> with no practical
    /// floor (methods.md §3.5.9), so with a dozen tests per window, warning alerts open by chance every few weeks of
    /// daily windows; turn it on for models whose warnings should reach a channel (a notification target with
    /// minimum severity <c>warning</c>), never a pager.
    /// </summary>
    public bool WarningAlerts { get; init; }

    /// <summary>Consecutive ok windows that resolve an open alert (hysteresis; common practice). Default 3.</summary>
    [Range(1, 100)]
    public int ResolveAfterOkWindows { get; init; } = 3;

    /// <summary>Consecutive empty runs that mark a dead feed (common practice). Default 3.</summary>
    [Range(1, 1000)]
    public int QuietRuns { get; init; } = 3;

    /// <summary>Share of rejected rows that warrants a warning (common practice). Default 0.01.</summary>
    public double RejectedShareWarning { get; init; } = 0.01;

    /// <summary>Share of rejected rows that is critical (common practice). Default 0.10.</summary>
    public double RejectedShareCritical { get; init; } = 0.10;

    /// <summary>Share of served predictions that disagree before the finding is critical (common practice). Default 0.005.</summary>
    public double ServedMismatchCritical { get; init; } = 0.005;

    /// <summary>Rows must be in time order for serial-correlation tests. Default true (rows are read in event time).</summary>
    public bool TimeOrdered { get; init; } = true;

    /// <summary>Time-ordered rows needed for Durbin–Watson (methods.md §3.5.5). Default 50.</summary>
    public int SerialCorrelationMinimumRows { get; init; } = 50;

    /// <summary>Rows beyond which Ljung–Box replaces Durbin–Watson (issue 4). Default 100.</summary>
    public int LjungBoxMinimumRows { get; init; } = 100;
}
