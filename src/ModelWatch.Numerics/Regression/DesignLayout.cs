namespace ModelWatch.Numerics.Regression;

/// <summary>
/// The columns of a regression design: an optional intercept, the features in order, and the outcome.
/// The augmented matrix <c>[X | y]</c> has <see cref="Width"/> = <see cref="ParameterCount"/> + 1 columns,
/// intercept first and outcome last.
/// </summary>
public sealed class DesignLayout
{
    /// <summary>The term name used for the intercept.</summary>
    public const string InterceptTerm = "(intercept)";

    /// <summary>Creates a layout, checking that names are present and distinct.</summary>
    public DesignLayout(IReadOnlyList<string> features, string outcome, bool intercept)
    {
        ArgumentNullException.ThrowIfNull(features);
        ArgumentException.ThrowIfNullOrWhiteSpace(outcome);
        var seen = new HashSet<string>(StringComparer.Ordinal) { outcome };
        foreach (string feature in features)
        {
            if (string.IsNullOrWhiteSpace(feature))
            {
                throw new ArgumentException("A feature name is empty.", nameof(features));
            }

            if (!seen.Add(feature))
            {
                throw new ArgumentException($"Column '{feature}' appears twice in the design (features and outcome must be distinct).", nameof(features));
            }
        }

        if (features.Count == 0 && !intercept)
        {
            throw new ArgumentException("A design needs at least one feature or an intercept.", nameof(features));
        }

        Features = [.. features];
        Outcome = outcome;
        Intercept = intercept;
        Terms = intercept ? [InterceptTerm, .. Features] : [.. Features];
    }

    /// <summary>Feature column names, in design order.</summary>
    public IReadOnlyList<string> Features { get; }

    /// <summary>The outcome column name.</summary>
    public string Outcome { get; }

    /// <summary>Whether the design has an intercept column (first).</summary>
    public bool Intercept { get; }

    /// <summary>Coefficient names in design order: <see cref="InterceptTerm"/> first when there is one.</summary>
    public IReadOnlyList<string> Terms { get; }

    /// <summary>Number of coefficients, the intercept included.</summary>
    public int ParameterCount => Terms.Count;

    /// <summary>Columns of the augmented matrix <c>[X | y]</c>.</summary>
    public int Width => Terms.Count + 1;

    /// <summary>Index of the first feature column in the design (1 with an intercept, else 0).</summary>
    public int FirstFeatureColumn => Intercept ? 1 : 0;
}
