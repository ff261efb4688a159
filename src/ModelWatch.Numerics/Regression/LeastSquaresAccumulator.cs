namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Streams rows of <c>[X | y]</c> into the (p+1)×(p+1) upper-triangular R factor of the augmented design,
/// by Householder reflections over row blocks. Memory is O(p²) plus one fixed block buffer, whatever the
/// number of rows; nothing is allocated per row. Two accumulators over disjoint rows merge into the factor
/// of their union (tall-skinny QR), so partitions can be read in parallel. Not thread-safe: use one per reader.
/// <para>
/// Each column enters the factor scaled by a power of two chosen from its first non-zero value (and raised if a much
/// larger one arrives), so values near 1e160 do not overflow the reflections' sums of squares and values near 1e-200
/// do not underflow them. Multiplying by a power of two is exact and Householder QR is equivariant under it, so the
/// factor read out (unscaled again, also exactly) is bit for bit what unscaled arithmetic gives wherever that does
/// not overflow or underflow, and right where it would.
/// </para>
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
    private readonly int[] _exponent;
    private readonly bool[] _scaled;
    private readonly double[] _inverse;
    private readonly double[] _ceiling;
    private int _pending;
    private long _offered;

    // A value this many binary orders above its column's scale moves the scale up, so scaled values stay far from overflow.
    private const int Headroom = 256;

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
        _exponent = new int[_k];
        _scaled = new bool[_k];
        _inverse = new double[_k];
        _ceiling = new double[_k];
        // An unscaled column's ceiling is 0: its first non-zero value crosses it and sets the scale.
        Array.Fill(_inverse, 1.0);
        if (layout.Intercept)
        {
            // The intercept's column of ones needs no scale.
            _scaled[0] = true;
            _ceiling[0] = Math.ScaleB(1.0, Headroom);
        }
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
            _block[(column * _blockRows) + r] = Scaled(column, v);
            _columns[i].Add(v);
        }

        _block[(column * _blockRows) + r] = Scaled(column, outcome);
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
        double[] theirs = (double[])other._factor.Clone();
        for (int j = 0; j < _k; j++)
        {
            if (!other._scaled[j])
            {
                continue;
            }

            if (!_scaled[j])
            {
                SetScale(j, other._exponent[j]);
            }
            else if (other._exponent[j] > _exponent[j])
            {
                Rescale(j, other._exponent[j]);
            }

            ScaleColumn(theirs, j, other._exponent[j] - _exponent[j]);
        }

        FoldFactor(theirs);
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
        double[] theirs = factor.ToRowMajor();
        for (int j = 0; j < _k; j++)
        {
            double largest = 0.0;
            for (int i = 0; i <= j; i++)
            {
                largest = Math.Max(largest, Math.Abs(theirs[(i * _k) + j]));
            }

            if (largest == 0.0)
            {
                continue;
            }

            int needed = Math.ILogB(largest);
            if (!_scaled[j])
            {
                SetScale(j, needed);
            }
            else if (needed - _exponent[j] > Headroom)
            {
                Rescale(j, needed);
            }

            ScaleColumn(theirs, j, -_exponent[j]);
        }

        FoldFactor(theirs);
        RowCount += factor.RowCount;
    }

    /// <summary>Returns the sign-normalised factor of every row folded in so far.</summary>
    /// <exception cref="ColumnScaleException">An entry of the unscaled factor does not fit in double precision.</exception>
    public AugmentedFactor ToFactor()
    {
        Flush();
        double[] unscaled = (double[])_factor.Clone();
        for (int j = 0; j < _k; j++)
        {
            ScaleColumn(unscaled, j, _exponent[j]);
            for (int i = 0; i <= j; i++)
            {
                if (!double.IsFinite(unscaled[(i * _k) + j]))
                {
                    throw new ColumnScaleException(Layout.Terms.Append(Layout.Outcome).ElementAt(j), "the root sum of its squared values over the rows");
                }
            }
        }

        return AugmentedFactor.FromRowMajor(Layout, RowCount, unscaled, _columns.Select(c => c.Copy()).ToArray());
    }

    /// <summary>A value as it enters the factor: scaled by its column's power of two, set or raised as needed.</summary>
    private double Scaled(int column, double value)
    {
        if (Math.Abs(value) > _ceiling[column])
        {
            int needed = Math.ILogB(value);
            if (!_scaled[column])
            {
                SetScale(column, needed);
            }
            else
            {
                Rescale(column, needed);
            }
        }

        return value * _inverse[column];
    }

    private void SetScale(int column, int exponent)
    {
        // Subnormal and near-overflow exponents are clamped so the scale itself is a normal power of two.
        exponent = Math.Clamp(exponent, -1000, 1000);
        _scaled[column] = true;
        _exponent[column] = exponent;
        _inverse[column] = Math.ScaleB(1.0, -exponent);
        _ceiling[column] = exponent + Headroom >= 1023 ? double.PositiveInfinity : Math.ScaleB(1.0, exponent + Headroom);
    }

    /// <summary>Moves a column's scale up to <paramref name="exponent"/>: its factor entries and buffered values are divided exactly.</summary>
    private void Rescale(int column, int exponent)
    {
        int shift = Math.Clamp(exponent, -1000, 1000) - _exponent[column];
        if (shift <= 0)
        {
            return;
        }

        ScaleColumn(_factor, column, -shift);
        Span<double> buffered = _block.AsSpan(column * _blockRows, _pending);
        for (int r = 0; r < buffered.Length; r++)
        {
            buffered[r] = Math.ScaleB(buffered[r], -shift);
        }

        SetScale(column, exponent);
    }

    /// <summary>Multiplies column <paramref name="column"/> of a row-major k×k factor by 2^<paramref name="power"/>.</summary>
    private void ScaleColumn(double[] factor, int column, int power)
    {
        if (power == 0)
        {
            return;
        }

        for (int i = 0; i <= column; i++)
        {
            factor[(i * _k) + column] = Math.ScaleB(factor[(i * _k) + column], power);
        }
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
