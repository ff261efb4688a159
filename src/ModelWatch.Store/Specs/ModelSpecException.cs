namespace ModelWatch.Store.Specs;

/// <summary>One or more model specs are invalid; <see cref="Problems"/> lists every problem found.</summary>
public sealed class ModelSpecException : Exception
{
    /// <summary>Creates the exception from the problems found.</summary>
    public ModelSpecException(IReadOnlyList<SpecProblem> problems)
        : base(string.Join(Environment.NewLine, problems))
    {
        Problems = problems;
    }

    /// <summary>Every problem, in file and field order.</summary>
    public IReadOnlyList<SpecProblem> Problems { get; }
}
