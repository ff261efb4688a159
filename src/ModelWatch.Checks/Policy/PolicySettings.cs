using ModelWatch.Checks.Evaluation;

namespace ModelWatch.Checks.Policy;

/// <summary>
/// The model-wide settings a spec may write under any check (they apply to the whole model): the false-alarm budget,
/// the CUSUMs' k and h, persistence, hysteresis and warning alerts.
/// </summary>
public static class PolicySettings
{
    /// <summary>False critical alerts per model-year.</summary>
    public static readonly CheckSetting FalseAlarmsPerYear = new() { Name = "false_alarms_per_year", Default = 1.0, Minimum = 1e-6, Maximum = 1000, Description = "false critical alerts a model may raise per year, spread equally over the alarm channels" };

    /// <summary>Channels the budget is split over.</summary>
    public static readonly CheckSetting AlarmChannels = new() { Name = "alarm_channels", Kind = SettingKind.WholeNumber, Default = 0, Minimum = 1, Maximum = 1000, Description = "alarm channels the budget is split over (default: the registered checks' channels)" };

    /// <summary>Warning level.</summary>
    public static readonly CheckSetting WarningAlpha = new() { Name = "warning_alpha", Default = 0.01, Minimum = 1e-12, Maximum = 0.5, Description = "significance level of a warning (no practical floor)" };

    /// <summary>CUSUM k.</summary>
    public static readonly CheckSetting CusumReference = new() { Name = "cusum_reference", Default = 0.5, Minimum = 0.0, Maximum = 5.0, Description = "CUSUM reference value k: half the standardized shift the CUSUMs are tuned for (Page 1954)" };

    /// <summary>CUSUM h for every CUSUM.</summary>
    public static readonly CheckSetting CusumThreshold = new() { Name = "cusum_threshold", Default = 0, Minimum = 0.1, Maximum = 1000, Description = "one threshold h for every CUSUM (default: each from its share of the budget)" };

    /// <summary>Persistence look-back.</summary>
    public static readonly CheckSetting PersistenceWindows = new() { Name = "persistence_windows", Kind = SettingKind.WholeNumber, Default = 3, Minimum = 1, Maximum = 20, Description = "runs looked back over for persistence of per-run tests" };

    /// <summary>Persistence count.</summary>
    public static readonly CheckSetting PersistenceRequired = new() { Name = "persistence_required", Kind = SettingKind.WholeNumber, Default = 2, Minimum = 1, Maximum = 20, Description = "critical runs among persistence_windows that open an alert from a per-run test" };

    /// <summary>Warning alerts.</summary>
    public static readonly CheckSetting WarningAlerts = new() { Name = "warning_alerts", Kind = SettingKind.Flag, Default = 0, Description = "open warning alerts when warnings persist" };

    /// <summary>Hysteresis.</summary>
    public static readonly CheckSetting ResolveAfterOkWindows = new() { Name = "resolve_after_ok_windows", Kind = SettingKind.WholeNumber, Default = 3, Minimum = 1, Maximum = 100, Description = "consecutive runs with nothing above ok that resolve an open alert (common practice)" };

    /// <summary>Every model-wide setting.</summary>
    public static IReadOnlyList<CheckSetting> All { get; } =
        [FalseAlarmsPerYear, AlarmChannels, WarningAlpha, CusumReference, CusumThreshold, PersistenceWindows, PersistenceRequired, WarningAlerts, ResolveAfterOkWindows];

    /// <summary>The thresholds with one model-wide setting applied.</summary>
    public static CheckThresholds Apply(CheckThresholds thresholds, CheckSetting setting, double value)
    {
        ArgumentNullException.ThrowIfNull(thresholds);
        ArgumentNullException.ThrowIfNull(setting);
        return setting.Name switch
        {
            "false_alarms_per_year" => thresholds with { FalseAlarmsPerYear = value },
            "alarm_channels" => thresholds with { AlarmChannels = (int)value },
            "warning_alpha" => thresholds with { WarningAlpha = value },
            "cusum_reference" => thresholds with { CusumReference = value },
            "cusum_threshold" => thresholds with { CusumThreshold = value },
            "persistence_windows" => thresholds with { PersistenceWindows = (int)value },
            "persistence_required" => thresholds with { PersistenceRequired = (int)value },
            "warning_alerts" => thresholds with { WarningAlerts = value != 0.0 },
            "resolve_after_ok_windows" => thresholds with { ResolveAfterOkWindows = (int)value },
            _ => throw new ArgumentException($"'{setting.Name}' is not a model-wide setting.", nameof(setting)),
        };
    }
}
