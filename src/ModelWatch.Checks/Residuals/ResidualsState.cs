using ModelWatch.Checks.Sequential;

namespace ModelWatch.Checks.Residuals;

/// <summary>The residuals check's memory: the fit of every row consumed so far, and the two CUSUMs.</summary>
public sealed record ResidualsState
{
    /// <summary>Factor of the reference rows plus every new row consumed since; null until the first increment.</summary>
    public StoredFactor? Running { get; init; }

    /// <summary>The bias CUSUM.</summary>
    public CusumSums Bias { get; init; } = new();

    /// <summary>The variance CUSUM.</summary>
    public CusumSums Variance { get; init; } = new();

    /// <summary>True from an alarm until both sums are back at zero: new rows are kept out of the running fit meanwhile.</summary>
    public bool Quarantined { get; init; }
}
