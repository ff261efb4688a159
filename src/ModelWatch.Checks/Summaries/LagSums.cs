namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Streaming lag products of a time-ordered series, enough for exact mean-centred autocorrelations up to a
/// maximum lag and the Durbin–Watson d; two consecutive parts merge exactly through their edge values.
/// </summary>
internal sealed class LagSums
{
    private readonly int _maxLag;
    private readonly double[] _products;
    private readonly List<double> _head = [];
    private readonly List<double> _tail = [];

    public LagSums(int maxLag)
    {
        _maxLag = maxLag;
        _products = new double[maxLag + 1];
    }

    public long Count { get; private set; }

    public double Sum { get; private set; }

    public void Add(double e)
    {
        for (int k = 1; k <= Math.Min(_maxLag, _tail.Count); k++)
        {
            _products[k] += e * _tail[^k];
        }

        _products[0] += e * e;
        Sum += e;
        Count++;
        if (_head.Count < _maxLag)
        {
            _head.Add(e);
        }

        _tail.Add(e);
        if (_tail.Count > _maxLag)
        {
            _tail.RemoveAt(0);
        }
    }

    /// <summary>Appends a series that follows this one in time.</summary>
    public void MergeFollowing(LagSums other)
    {
        for (int k = 1; k <= _maxLag; k++)
        {
            // Pairs (left value, right value) k apart that straddle the boundary.
            for (int j = 0; j < k && j < other._head.Count; j++)
            {
                int back = k - j;
                if (back <= _tail.Count)
                {
                    _products[k] += other._head[j] * _tail[^back];
                }
            }

            _products[k] += other._products[k];
        }

        _products[0] += other._products[0];
        Sum += other.Sum;
        Count += other.Count;
        foreach (double v in other._head)
        {
            if (_head.Count < _maxLag)
            {
                _head.Add(v);
            }
        }

        foreach (double v in other._tail)
        {
            _tail.Add(v);
        }

        while (_tail.Count > _maxLag)
        {
            _tail.RemoveAt(0);
        }
    }

    /// <summary>Mean-centred autocorrelations r_1..r_h (h ≤ max lag, h &lt; count).</summary>
    public double[] Autocorrelations(int lags)
    {
        double n = Count;
        double mean = Sum / n;
        double c0 = _products[0] - (n * mean * mean);
        var r = new double[lags];
        for (int k = 1; k <= lags; k++)
        {
            double firstK = _head.Take(k).Sum();
            double lastK = _tail.Skip(_tail.Count - k).Sum();
            double ck = _products[k] - (mean * ((Sum - firstK) + (Sum - lastK))) + ((n - k) * mean * mean);
            r[k - 1] = ck / c0;
        }

        return r;
    }

    /// <summary>Durbin–Watson d of the mean-centred series.</summary>
    public double DurbinWatson()
    {
        if (Count < 2)
        {
            return double.NaN;
        }

        double n = Count;
        double mean = Sum / n;
        double c0 = _products[0] - (n * mean * mean);
        double firstD = _head[0] - mean;
        double lastD = _tail[^1] - mean;
        double c1 = _products[1] - (mean * ((Sum - _head[0]) + (Sum - _tail[^1]))) + ((n - 1) * mean * mean);
        return ((2.0 * c0) - (firstD * firstD) - (lastD * lastD) - (2.0 * c1)) / c0;
    }
}
