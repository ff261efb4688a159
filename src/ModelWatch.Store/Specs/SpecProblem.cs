namespace ModelWatch.Store.Specs;

/// <summary>One thing wrong with a model spec: where (file and field path) and why.</summary>
public sealed record SpecProblem(string File, string FieldPath, string Message)
{
    /// <inheritdoc />
    public override string ToString() => string.IsNullOrEmpty(FieldPath) ? $"{File}: {Message}" : $"{File}: {FieldPath}: {Message}";
}
