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

    /// <summary>The statistic's value.</summary>
    public double? Value { get; init; }

    /// <summary>The p-value (Holm-adjusted where a family was tested).</summary>
    public double? PValue { get; init; }

    /// <summary>The significance level or limit the value was compared with.</summary>
    public double? Threshold { get; init; }

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
