using ModelWatch.Checks.Sequential;

namespace ModelWatch.Checks.Collinearity;

/// <summary>The collinearity check's memory: new rows gathered until they are enough for a reading of their own.</summary>
public sealed record CollinearityState
{
    /// <summary>New rows not yet read; null when none wait.</summary>
    public StoredFactor? Pending { get; init; }
}
