namespace ModelWatch.Daemon.Persistence;

/// <summary>A recorded finding as operators read it back (<c>modelwatch.finding</c>).</summary>
public sealed class FindingView
{
    /// <summary>The select list that fills this class from <c>modelwatch.finding</c>.</summary>
    internal const string Columns = """
        run_id AS RunId, check_name AS Check, subject AS Subject, statistic AS Statistic, value AS Value, p_value AS PValue,
        threshold AS Threshold, alpha AS Alpha, limit_value AS Limit, effect_size AS EffectSize, severity AS Severity,
        details ->> 'skipped' AS SkipReason, explanation AS Explanation, details::text AS Details
        """;

    /// <summary>The run that recorded it.</summary>
    public long RunId { get; set; }

    /// <summary>Check name.</summary>
    public string Check { get; set; } = string.Empty;

    /// <summary>Coefficient, feature or column; null for the model as a whole.</summary>
    public string? Subject { get; set; }

    /// <summary>The statistic's name.</summary>
    public string Statistic { get; set; } = string.Empty;

    /// <summary>The statistic's value.</summary>
    public double? Value { get; set; }

    /// <summary>The p-value, or null when the test has none.</summary>
    public double? PValue { get; set; }

    /// <summary>The old single column: the alpha when a p-value graded the finding, else the limit.</summary>
    public double? Threshold { get; set; }

    /// <summary>The significance level the p-value was graded at, or null (also for findings recorded before schema 4).</summary>
    public double? Alpha { get; set; }

    /// <summary>The value the statistic was compared with, in its own units, or null (also for findings recorded before schema 4).</summary>
    public double? Limit { get; set; }

    /// <summary>The effect size.</summary>
    public double? EffectSize { get; set; }

    /// <summary>ok, warning or critical; a skipped test is stored as ok, so read <see cref="SkipReason"/> first.</summary>
    public string Severity { get; set; } = string.Empty;

    /// <summary>Why the test could not run (<c>insufficient_data</c>, …), or null when it ran.</summary>
    public string? SkipReason { get; set; }

    /// <summary>The one-line explanation.</summary>
    public string Explanation { get; set; } = string.Empty;

    /// <summary>Supporting numbers and flags as stored (JSON object).</summary>
    public string Details { get; set; } = "{}";
}
