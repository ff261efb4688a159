using ModelWatch.Checks.Summaries;

namespace ModelWatch.Store.Baselines;

/// <summary>One stored baseline version of a model.</summary>
public sealed record StoredBaseline(
    string ModelKey,
    int Version,
    string DesignSignature,
    DateTimeOffset? ReferenceWindowStart,
    DateTimeOffset? ReferenceWindowEnd,
    DateTimeOffset CreatedAt,
    string CreatedBy,
    BaselineReference Reference);
