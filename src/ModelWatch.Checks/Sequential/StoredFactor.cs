using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Sequential;

/// <summary>A factor T of <c>[X | y]</c> as a state document stores it: its rows and its row count.</summary>
public sealed record StoredFactor
{
    /// <summary>T's rows (row-major).</summary>
    public required double[][] Rows { get; init; }

    /// <summary>Rows folded into T.</summary>
    public required long Count { get; init; }

    /// <summary>Stores a factor.</summary>
    public static StoredFactor Of(AugmentedFactor factor)
    {
        ArgumentNullException.ThrowIfNull(factor);
        return new StoredFactor { Rows = factor.ToRows(), Count = factor.RowCount };
    }

    /// <summary>The factor back, for a layout.</summary>
    public AugmentedFactor ToFactor(DesignLayout layout) => AugmentedFactor.FromRowMajor(layout, Count, Rows.SelectMany(r => r).ToArray());
}
