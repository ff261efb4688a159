using ModelWatch.Checks.Evaluation;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// A model's settings for one run: the model-wide budget and alert-policy values (typed here; their defaults, ranges and
/// descriptions are <see cref="PolicySettings"/>), the schedule facts the budget needs, and every check's own overrides in
/// <see cref="Settings"/> (a check's defaults live with the check, <see cref="IModelCheck.Settings"/>).
/// docs/checks.md lists every setting with its default and source.
/// </summary>
public sealed record CheckThresholds
{
    /// <summary>False critical alerts a model may raise per year, spent across all alarm channels. Default 1.</summary>
    public double FalseAlarmsPerYear { get; init; } = PolicySettings.FalseAlarmsPerYear.Default;

    /// <summary>Alarm channels the budget is split over equally; null counts the registered checks' channels.</summary>
    public int? AlarmChannels { get; init; }

    /// <summary>How often the model runs (from the spec's schedule). Default 1 hour.</summary>
    public TimeSpan Cadence { get; init; } = TimeSpan.FromHours(1);

    /// <summary>Length of the window each run reads (from the spec's window). Default 24 hours.</summary>
    public TimeSpan WindowLength { get; init; } = TimeSpan.FromHours(24);

    /// <summary>Overrides every budgeted α and monitor size (calibration simulations only). Default none.</summary>
    public double? AlphaOverride { get; init; }

    /// <summary>Significance level of a warning, with no practical floor. Default 0.01.</summary>
    public double WarningAlpha { get; init; } = PolicySettings.WarningAlpha.Default;

    /// <summary>Minimum usable rows (from the spec's min_rows); null means max(30, 10p).</summary>
    public int? MinimumRows { get; init; }

    /// <summary>CUSUM reference value k, half the standardized shift each CUSUM is tuned for. Default 0.5.</summary>
    public double CusumReference { get; init; } = PolicySettings.CusumReference.Default;

    /// <summary>One CUSUM threshold h for every CUSUM; null derives each from the budget by its ARL. Default null.</summary>
    public double? CusumThreshold { get; init; }

    /// <summary>Runs looked back over for persistence. Default 3.</summary>
    public int PersistenceWindows { get; init; } = (int)PolicySettings.PersistenceWindows.Default;

    /// <summary>Critical runs among <see cref="PersistenceWindows"/> that open an alert from a per-run test. Default 2.</summary>
    public int PersistenceRequired { get; init; } = (int)PolicySettings.PersistenceRequired.Default;

    /// <summary>
    /// Also open <c>warning</c> alerts when warnings persist (<see cref="PersistenceRequired"/> of the last
    /// <see cref="PersistenceWindows"/> runs at warning or above); critical evidence escalates them. Default false: a
    /// warning is one test at <see cref="WarningAlpha"/> with no practical floor, so chance warning alerts are frequent.
    /// </summary>
    public bool WarningAlerts { get; init; } = PolicySettings.WarningAlerts.Default != 0.0;

    /// <summary>Consecutive runs with nothing above ok that resolve an open alert (hysteresis; common practice). Default 3.</summary>
    public int ResolveAfterOkWindows { get; init; } = (int)PolicySettings.ResolveAfterOkWindows.Default;

    /// <summary>The checks' own overrides, by <see cref="CheckSetting.Key"/> (<c>check.name</c>).</summary>
    public IReadOnlyDictionary<string, double> Settings { get; init; } = new Dictionary<string, double>(StringComparer.Ordinal);

    /// <summary>The value of a check's setting: the override, else its default.</summary>
    public double Value(CheckSetting setting)
    {
        ArgumentNullException.ThrowIfNull(setting);
        return Settings.TryGetValue(setting.Key, out double value) ? value : setting.Default;
    }

    /// <summary>These thresholds with one check setting overridden.</summary>
    public CheckThresholds With(CheckSetting setting, double value)
    {
        ArgumentNullException.ThrowIfNull(setting);
        var settings = new Dictionary<string, double>(Settings, StringComparer.Ordinal) { [setting.Key] = value };
        return this with { Settings = settings };
    }
}
