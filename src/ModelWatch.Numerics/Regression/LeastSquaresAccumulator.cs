namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Streams rows of <c>[X | y]</c> into the (p+1)×(p+1) upper-triangular R factor of the augmented design,
/// by Householder reflections over row blocks. Memory is O(p²) plus one fixed block buffer, whatever the
/// number of rows; nothing is allocated per row. Two accumulators over disjoint rows merge into the factor
/// of their union (tall-skinny QR), so partitions can be read in parallel. Not thread-safe: use one per reader.
/// </summary>
public sealed class LeastSquaresAccumulator
{
    /// <summary>Rows buffered before they are folded into the factor.</summary>
    public const int DefaultBlockRows = 256;

    private readonly int _k;
    private readonly int _featureCount;
    private readonly int _blockRows;
    private readonly double[] _factor;
    private readonly double[] _block;
    private readonly ColumnSummary[] _columns;
    private readonly NonFiniteValuePolicy _policy;
    private int _pending;
    private long _offered;

    /// <summary>Creates an empty accumulator for a design.</summary>
    public LeastSquaresAccumulator(DesignLayout layout, NonFiniteValuePolicy policy = NonFiniteValuePolicy.Fail, int blockRows = DefaultBlockRows)
    {
        ArgumentNullException.ThrowIfNull(layout);
        ArgumentOutOfRangeException.ThrowIfLessThan(blockRows, 1);
        Layout = layout;
        _policy = policy;
        _k = layout.Width;
        _featureCount = layout.Features.Count;
        _blockRows = blockRows;
        _factor = new double[_k * _k];
        _block = new double[_k * blockRows];
        _columns = new ColumnSummary[_featureCount + 1];
        for (int i = 0; i < _featureCount; i++)
        {
            _columns[i] = new ColumnSummary(layout.Features[i]);
        }

        _columns[_featureCount] = new ColumnSummary(layout.Outcome);
    }

    /// <summary>The design this accumulator fits.</summary>
    public DesignLayout Layout { get; }

    /// <summary>Rows folded in (accepted).</summary>
    public long RowCount { get; private set; }

    /// <summary>Rows left out because a value was not finite (only under <see cref="NonFiniteValuePolicy.RejectRow"/>).</summary>
    public long RejectedRowCount { get; private set; }

    /// <summary>Per-column summaries: the features in order, then the outcome.</summary>
    public IReadOnlyList<ColumnSummary> Columns => _columns;

    /// <summary>
    /// Offers one row. Returns false when the row was rejected for a non-finite value; throws
    /// <see cref="NonFiniteValueException"/> instead under <see cref="NonFiniteValuePolicy.Fail"/>.
    /// </summary>
    public bool AddRow(ReadOnlySpan<double> features, double outcome)
    {
        if (features.Length != _featureCount)
        {
            throw new ArgumentException($"Expected {_featureCount} feature values, got {features.Length}.", nameof(features));
        }

        _offered++;
        if (!IsRowFinite(features, outcome))
        {
            return false;
        }

        int r = _pending;
        int column = 0;
        if (Layout.Intercept)
        {
            _block[r] = 1.0;
            column = 1;
        }

        for (int i = 0; i < features.Length; i++, column++)
        {
            double v = features[i];
            _block[(column * _blockRows) + r] = v;
            _columns[i].Add(v);
        }

        _block[(column * _blockRows) + r] = outcome;
        _columns[_featureCount].Add(outcome);
        RowCount++;
        if (++_pending == _blockRows)
        {
            Flush();
        }

        return true;
    }

    /// <summary>
    /// Offers a block of rows laid out row-major, each row holding the features in order and then the outcome.
    /// Returns the number of rows accepted.
    /// </summary>
    public int AddRows(ReadOnlySpan<double> rowMajor)
    {
        int stride = _featureCount + 1;
        if (rowMajor.Length % stride != 0)
        {
            throw new ArgumentException($"Row-major block length {rowMajor.Length} is not a multiple of {stride} (features + outcome).", nameof(rowMajor));
        }

        int accepted = 0;
        for (int offset = 0; offset < rowMajor.Length; offset += stride)
        {
            if (AddRow(rowMajor.Slice(offset, _featureCount), rowMajor[offset + _featureCount]))
            {
                accepted++;
            }
        }

        return accepted;
    }

    /// <summary>Folds another accumulator's rows into this one (the other is left as it was, apart from flushing its buffer).</summary>
    public void Merge(LeastSquaresAccumulator other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (ReferenceEquals(other, this))
        {
            throw new ArgumentException("An accumulator cannot be merged with itself.", nameof(other));
        }

        if (other._k != _k || other.Layout.Intercept != Layout.Intercept || !other.Layout.Terms.SequenceEqual(Layout.Terms, StringComparer.Ordinal))
        {
            throw new ArgumentException("Accumulators with different designs cannot be merged.", nameof(other));
        }

        Flush();
        other.Flush();
        FoldFactor(other._factor);
        RowCount += other.RowCount;
        RejectedRowCount += other.RejectedRowCount;
        _offered += other._offered;
        for (int i = 0; i < _columns.Length; i++)
        {
            _columns[i].Merge(other._columns[i]);
        }
    }

    /// <summary>Folds a stored factor of the same design (for example a baseline's) into this accumulator.</summary>
    public void Merge(AugmentedFactor factor)
    {
        ArgumentNullException.ThrowIfNull(factor);
        if (factor.Width != _k)
        {
            throw new ArgumentException("The factor belongs to a design of another width.", nameof(factor));
        }

        Flush();
        FoldFactor(factor.ToRowMajor());
        RowCount += factor.RowCount;
    }

    /// <summary>Returns the sign-normalised factor of every row folded in so far.</summary>
    public AugmentedFactor ToFactor()
    {
        Flush();
        return AugmentedFactor.FromRowMajor(Layout, RowCount, _factor, _columns.Select(c => c.Copy()).ToArray());
    }

    private bool IsRowFinite(ReadOnlySpan<double> features, double outcome)
    {
        bool finite = true;
        for (int i = 0; i < features.Length; i++)
        {
            if (!double.IsFinite(features[i]))
            {
                OnNonFinite(i, features[i]);
                finite = false;
            }
        }

        if (!double.IsFinite(outcome))
        {
            OnNonFinite(_featureCount, outcome);
            finite = false;
        }

        if (!finite)
        {
            RejectedRowCount++;
        }

        return finite;
    }

    private void OnNonFinite(int column, double value)
    {
        if (_policy == NonFiniteValuePolicy.Fail)
        {
            throw new NonFiniteValueException(_columns[column].Name, value, _offered);
        }

        _columns[column].AddNonFinite();
    }

    private void Flush()
    {
        if (_pending == 0)
        {
            return;
        }

        HouseholderUpdate.Apply(_factor, _k, _block, _blockRows, _pending);
        _pending = 0;
    }

    private void FoldFactor(double[] otherRowMajor)
    {
        // The other factor's k rows are stacked under ours as one column-major block.
        double[] block = new double[_k * _k];
        for (int i = 0; i < _k; i++)
        {
            for (int j = i; j < _k; j++)
            {
                block[(j * _k) + i] = otherRowMajor[(i * _k) + j];
            }
        }

        HouseholderUpdate.Apply(_factor, _k, block, _k, _k);
    }
}
