namespace ModelWatch.Daemon.Telemetry;

/// <summary>
/// The names ModelWatch publishes through OpenTelemetry: one meter, one activity source, dotted lowercase
/// instrument names under <c>modelwatch.</c>, and attribute keys. Dashboards and alert rules depend on these;
/// change them only with a release note.
/// </summary>
public static class TelemetryNames
{
    /// <summary>The meter and activity source name.</summary>
    public const string Source = "ModelWatch";

    /// <summary>Histogram of run duration, seconds.</summary>
    public const string RunDuration = "modelwatch.run.duration";

    /// <summary>Counter of runs by outcome.</summary>
    public const string Runs = "modelwatch.runs";

    /// <summary>Counter of rows read from data sources.</summary>
    public const string RowsRead = "modelwatch.rows.read";

    /// <summary>Counter of rows rejected (NULL, non-finite).</summary>
    public const string RowsRejected = "modelwatch.rows.rejected";

    /// <summary>Counter of alert transitions.</summary>
    public const string AlertTransitions = "modelwatch.alert.transitions";

    /// <summary>Gauge: the deployed model's RMSE on the latest window over the baseline residual SD.</summary>
    public const string RmseRatio = "modelwatch.model.rmse_ratio";

    /// <summary>Gauge: scaled (BKW) condition number of the latest window's design.</summary>
    public const string ConditionNumber = "modelwatch.model.condition_number";

    /// <summary>Gauge: largest |z| of a coefficient against the baseline.</summary>
    public const string MaxCoefficientZ = "modelwatch.model.coefficient_z.max";

    /// <summary>Gauge: largest population stability index over the features.</summary>
    public const string MaxPsi = "modelwatch.model.psi.max";

    /// <summary>Gauge: open (unresolved) alerts by severity.</summary>
    public const string OpenAlerts = "modelwatch.model.alerts.open";

    /// <summary>Gauge: 1 while the source check's alert is open (the model is not being watched).</summary>
    public const string SourceAlertOpen = "modelwatch.model.source_alert.open";

    /// <summary>Gauge: failed runs in a row.</summary>
    public const string ConsecutiveFailures = "modelwatch.model.consecutive_failures";

    /// <summary>Gauge: seconds since the newest row the source delivered.</summary>
    public const string DataAge = "modelwatch.model.data.age";

    /// <summary>Gauge: seconds since the latest recorded run.</summary>
    public const string LastRunAge = "modelwatch.model.last_run.age";

    /// <summary>Gauge: the schedule's period.</summary>
    public const string SchedulePeriod = "modelwatch.model.schedule.period";

    /// <summary>Attribute: the model key.</summary>
    public const string ModelTag = "modelwatch.model";

    /// <summary>Attribute: the check name.</summary>
    public const string CheckTag = "modelwatch.check";

    /// <summary>Attribute: the finding or alert subject (coefficient or feature).</summary>
    public const string SubjectTag = "modelwatch.subject";

    /// <summary>Attribute: severity (<c>warning</c>, <c>critical</c>).</summary>
    public const string SeverityTag = "modelwatch.severity";

    /// <summary>Attribute: run status (<c>ok</c>, <c>failed</c>, <c>skipped</c>).</summary>
    public const string StatusTag = "modelwatch.run.status";

    /// <summary>Attribute: alert state after a transition.</summary>
    public const string StateTag = "modelwatch.alert.state";

    /// <summary>Attribute: the statistic's name.</summary>
    public const string StatisticTag = "modelwatch.statistic";

    /// <summary>Attribute: the statistic's value.</summary>
    public const string ValueTag = "modelwatch.value";

    /// <summary>Attribute: the threshold it was compared with.</summary>
    public const string ThresholdTag = "modelwatch.threshold";

    /// <summary>Attribute: the evidence's p-value, where the test has one.</summary>
    public const string PValueTag = "modelwatch.p_value";

    /// <summary>Attribute: the level the p-value was graded at, where there is one.</summary>
    public const string AlphaTag = "modelwatch.alpha";

    /// <summary>Attribute: the value the statistic was compared with, where there is one.</summary>
    public const string LimitTag = "modelwatch.limit";

    /// <summary>Semantic-convention attribute for the class of a failure.</summary>
    public const string ErrorTypeTag = "error.type";
}
