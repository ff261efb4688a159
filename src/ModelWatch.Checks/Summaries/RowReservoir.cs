namespace ModelWatch.Checks.Summaries;

/// <summary>
/// A seeded uniform reservoir sample of rows (Vitter's algorithm R), remembering each row's position so that
/// the kept rows can be put back in time order. Two reservoirs over consecutive row ranges merge into a
/// uniform sample of the union by drawing from each side in proportion to the rows it stands for.
/// </summary>
internal sealed class RowReservoir
{
    private readonly List<(long Index, double[] Row)> _rows;
    private readonly Random _random;

    public RowReservoir(int capacity, int seed)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(capacity, 1);
        Capacity = capacity;
        _rows = new List<(long, double[])>(Math.Min(capacity, 1024));
        _random = new Random(seed);
    }

    public int Capacity { get; }

    /// <summary>Rows offered so far (the population the sample stands for).</summary>
    public long Seen { get; private set; }

    public int Count => _rows.Count;

    public void Offer(ReadOnlySpan<double> row)
    {
        long index = Seen++;
        if (_rows.Count < Capacity)
        {
            _rows.Add((index, row.ToArray()));
            return;
        }

        long slot = _random.NextInt64(index + 1);
        if (slot < Capacity)
        {
            // The evicted row's array is the reservoir's own: reuse it, so a long window allocates nothing per row.
            double[] kept = _rows[(int)slot].Row;
            row.CopyTo(kept);
            _rows[(int)slot] = (index, kept);
        }
    }

    /// <summary>Folds in a reservoir over the rows that follow this one's (positions are shifted after ours).</summary>
    public void MergeFollowing(RowReservoir other)
    {
        long offset = Seen;
        var left = new List<(long Index, double[] Row)>(_rows);
        var right = other._rows.Select(r => (r.Index + offset, r.Row)).ToList();
        long leftPopulation = Seen;
        long rightPopulation = other.Seen;
        int target = (int)Math.Min(Capacity, leftPopulation + rightPopulation);
        _rows.Clear();
        for (int i = 0; i < target; i++)
        {
            bool fromLeft = rightPopulation == 0 || (leftPopulation > 0 && _random.NextDouble() * (leftPopulation + rightPopulation) < leftPopulation);
            List<(long Index, double[] Row)> side = fromLeft ? left : right;
            int pick = _random.Next(side.Count);
            _rows.Add(side[pick]);
            side[pick] = side[^1];
            side.RemoveAt(side.Count - 1);
            if (fromLeft)
            {
                leftPopulation--;
            }
            else
            {
                rightPopulation--;
            }
        }

        Seen += other.Seen;
    }

    /// <summary>The kept rows in the order they were offered.</summary>
    public List<double[]> InOrder() => _rows.OrderBy(r => r.Index).Select(r => r.Row).ToList();
}
