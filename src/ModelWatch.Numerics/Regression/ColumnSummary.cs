namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Count, minimum, maximum and sum of one source column over the rows that were folded in,
/// plus how many of its values were not finite. Mergeable, so partitions can be summarised apart.
/// </summary>
public sealed class ColumnSummary
{
    /// <summary>Creates an empty summary for the named column.</summary>
    public ColumnSummary(string name)
    {
        Name = name;
        Minimum = double.PositiveInfinity;
        Maximum = double.NegativeInfinity;
    }

    /// <summary>The column name.</summary>
    public string Name { get; }

    /// <summary>Finite values folded in.</summary>
    public long Count { get; private set; }

    /// <summary>Smallest value seen (+∞ while empty).</summary>
    public double Minimum { get; private set; }

    /// <summary>Largest value seen (−∞ while empty).</summary>
    public double Maximum { get; private set; }

    /// <summary>Sum of the values.</summary>
    public double Sum { get; private set; }

    /// <summary>Values that were NaN or infinite (their rows were rejected or the read failed).</summary>
    public long NonFiniteCount { get; private set; }

    /// <summary>Mean of the values, or NaN while empty.</summary>
    public double Mean => Count == 0 ? double.NaN : Sum / Count;

    /// <summary>True when at least one value was seen and all were equal.</summary>
    public bool IsConstant => Count > 0 && Minimum == Maximum;

    internal void Add(double value)
    {
        Count++;
        Sum += value;
        if (value < Minimum)
        {
            Minimum = value;
        }

        if (value > Maximum)
        {
            Maximum = value;
        }
    }

    internal void AddNonFinite() => NonFiniteCount++;

    internal void Merge(ColumnSummary other)
    {
        Count += other.Count;
        Sum += other.Sum;
        NonFiniteCount += other.NonFiniteCount;
        Minimum = Math.Min(Minimum, other.Minimum);
        Maximum = Math.Max(Maximum, other.Maximum);
    }

    internal ColumnSummary Copy()
    {
        var copy = new ColumnSummary(Name);
        copy.Merge(this);
        return copy;
    }
}
