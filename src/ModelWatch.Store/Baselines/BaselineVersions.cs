namespace ModelWatch.Store.Baselines;

/// <summary>A model's stored baseline versions (oldest first) and the version an operator pinned, if any.</summary>
/// <param name="Versions">Every stored version, ascending.</param>
/// <param name="Pinned"><c>modelwatch.model.active_baseline_version</c>: null means "the newest".</param>
public sealed record BaselineVersions(IReadOnlyList<int> Versions, int? Pinned)
{
    /// <summary>The version the model is watched against: the pinned one, else the newest; null with no baseline.</summary>
    public int? Active => Pinned ?? (Versions.Count == 0 ? null : Versions[^1]);

    /// <summary>The versions as an operator reads them, e.g. "1, 2, 3", or "none".</summary>
    public string Describe() => Versions.Count == 0 ? "none" : string.Join(", ", Versions);
}
