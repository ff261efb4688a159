namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Why a design lost numerical rank, naming the columns: the terms that were dropped and, for each,
/// the plain-language reason (constant column, exact combination of others, too few rows).
/// </summary>
/// <param name="AliasedTerms">Terms dropped from the fit, in design order.</param>
/// <param name="Reasons">One sentence per problem, naming the columns involved.</param>
public sealed record RankDeficiency(IReadOnlyList<string> AliasedTerms, IReadOnlyList<string> Reasons)
{
    /// <summary>All reasons joined into one message.</summary>
    public string Message => string.Join("; ", Reasons);
}
