using ModelWatch.Store.Specs;

namespace ModelWatch.Store.Models;

/// <summary>A registered model as the state database holds it, with its current baseline (if any): the active version when one is set, else the newest.</summary>
public sealed record ModelRecord(
    ModelSpec Spec,
    bool Enabled,
    DateTimeOffset? NextDueSlot,
    string? LeaseOwner,
    DateTimeOffset? LeaseExpiresAt,
    string? SourceFile,
    DateTimeOffset CreatedAt,
    DateTimeOffset UpdatedAt,
    int? BaselineVersion,
    string? BaselineDesignSignature)
{
    /// <summary>The model's key.</summary>
    public string Key => Spec.Key;

    /// <summary>True when a current baseline exists and was made for the spec's outcome, features and intercept.</summary>
    public bool HasCompatibleBaseline => BaselineDesignSignature is not null && BaselineDesignSignature == Spec.DesignSignature;

    /// <summary>Why runs of this model would be skipped for want of a baseline, or null when a compatible one exists.</summary>
    public string? BaselineProblem => BaselineVersion is null
        ? "no baseline: run 'modelwatch baseline fit' or 'modelwatch baseline import'"
        : HasCompatibleBaseline
            ? null
            : $"baseline version {BaselineVersion} was made for '{BaselineDesignSignature}' but the spec now says '{Spec.DesignSignature}'; store a new baseline or activate one made for this design ('modelwatch baseline activate')";
}
