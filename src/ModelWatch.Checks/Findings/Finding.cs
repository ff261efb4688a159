namespace ModelWatch.Checks.Findings;

/// <summary>
/// One test's verdict on one window: what was measured, how surprising it is, how large, and a one-line
/// explanation a person can act on. A test that could not run has <see cref="Skipped"/> set and says why.
/// Numbers are finite or null, so the finding serialises to plain JSON.
/// </summary>
public sealed record Finding
{
    /// <summary>The check (one of <see cref="CheckNames"/>).</summary>
    public required string Check { get; init; }

    /// <summary>The coefficient, feature or column concerned; null when the finding is about the model as a whole.</summary>
    public string? Subject { get; init; }

    /// <summary>The statistic's name, e.g. <c>wald</c>, <c>psi</c>, <c>bias_t</c>.</summary>
    public required string Statistic { get; init; }

    /// <summary>
    /// The statistic's value, in its own units: the number the explanation prints for it and the one <see cref="Limit"/>
    /// is compared with (a two-sided statistic by its absolute value).
    /// </summary>
    public double? Value { get; init; }

    /// <summary>The p-value (Holm- or Bonferroni-adjusted where a family was tested); null when the test has none.</summary>
    public double? PValue { get; init; }

    /// <summary>
    /// The significance level <see cref="PValue"/> was compared with to grade the finding: the run's budgeted α for a
    /// test that can page, the model's warning level for a test that only warns. Null when no p-value decides the
    /// severity (a CUSUM, a monitor, a count against a setting).
    /// </summary>
    public double? Alpha { get; init; }

    /// <summary>
    /// The value <see cref="Value"/> itself was compared with, in the statistic's units: a CUSUM's h, a monitor's
    /// boundary, a PSI cut-off, a VIF limit, a setting's count or share, or the critical value a significance test's α
    /// gives the statistic (a z's or a chi-square's). Null when the statistic has no such cut-off.
    /// </summary>
    public double? Limit { get; init; }

    /// <summary>
    /// Kept for readers of the old single column: <see cref="Alpha"/> when the finding is graded by its p-value, else
    /// <see cref="Limit"/>. New readers should use those two.
    /// </summary>
    public double? Threshold => Alpha ?? Limit;

    /// <summary>The verdict.</summary>
    public Severity Severity { get; init; }

    /// <summary>The practical size of the change, in the unit <see cref="EffectSizeName"/> names.</summary>
    public double? EffectSize { get; init; }

    /// <summary>What the effect size measures.</summary>
    public string? EffectSizeName { get; init; }

    /// <summary>One line for the on-call engineer.</summary>
    public required string Explanation { get; init; }

    /// <summary>Supporting numbers (finite values only).</summary>
    public IReadOnlyDictionary<string, double> Details { get; init; } = new Dictionary<string, double>();

    /// <summary>True when the test could not run; <see cref="SkipReason"/> says why.</summary>
    public bool Skipped { get; init; }

    /// <summary>One of <see cref="SkipReasons"/> when skipped.</summary>
    public string? SkipReason { get; init; }

    /// <summary>
    /// False for evidence that needs no repetition before an alert opens (a CUSUM or monitor crossing, a block of new
    /// rows, lost rank, a quiet source, served predictions that disagree); true for per-run tests on the window (2 of the
    /// last 3 runs by default).
    /// </summary>
    public bool RequiresPersistence { get; init; } = true;
}
