namespace ModelWatch.Numerics.Regression;

/// <summary>
/// The upper-triangular R factor <c>T</c> of the augmented design <c>[X | y]</c> (intercept column first,
/// outcome last), with the row count and column summaries: everything a fit summary, a Chow test or a
/// merge needs, without the raw rows. Rows are sign-normalised (<c>T[i,i] ≥ 0</c>) so stored factors
/// are reproducible. Immutable.
/// </summary>
public sealed class AugmentedFactor
{
    private readonly double[] _t;

    private AugmentedFactor(DesignLayout layout, long rowCount, double[] t, IReadOnlyList<ColumnSummary> columns)
    {
        Layout = layout;
        RowCount = rowCount;
        _t = t;
        Columns = columns;
    }

    /// <summary>The design.</summary>
    public DesignLayout Layout { get; }

    /// <summary>Rows folded into the factor.</summary>
    public long RowCount { get; }

    /// <summary>Columns of the augmented matrix (parameters + 1).</summary>
    public int Width => Layout.Width;

    /// <summary>Per-column summaries (features, then outcome); empty when the factor was built from stored values only.</summary>
    public IReadOnlyList<ColumnSummary> Columns { get; }

    /// <summary>Entry <c>T[i, j]</c> (zero below the diagonal).</summary>
    public double this[int i, int j] => _t[(i * Width) + j];

    /// <summary>Residual sum of squares of the full least-squares fit: <c>T[p,p]²</c>.</summary>
    public double ResidualSumOfSquares => _t[(Width * Width) - 1] * _t[(Width * Width) - 1];

    /// <summary>Creates a factor from a row-major copy, normalising row signs.</summary>
    public static AugmentedFactor FromRowMajor(DesignLayout layout, long rowCount, ReadOnlySpan<double> rowMajor, IReadOnlyList<ColumnSummary>? columns = null)
    {
        ArgumentNullException.ThrowIfNull(layout);
        int k = layout.Width;
        if (rowMajor.Length != k * k)
        {
            throw new ArgumentException($"A factor for {k} augmented columns needs {k * k} entries, got {rowMajor.Length}.", nameof(rowMajor));
        }

        ArgumentOutOfRangeException.ThrowIfNegative(rowCount);
        double[] t = new double[k * k];
        for (int i = 0; i < k; i++)
        {
            double sign = rowMajor[(i * k) + i] < 0.0 ? -1.0 : 1.0;
            for (int j = i; j < k; j++)
            {
                double v = rowMajor[(i * k) + j];
                if (!double.IsFinite(v))
                {
                    throw new ArgumentException($"Factor entry [{i},{j}] is not finite.", nameof(rowMajor));
                }

                t[(i * k) + j] = sign * v;
            }
        }

        return new AugmentedFactor(layout, rowCount, t, columns ?? []);
    }

    /// <summary>Returns a row-major copy of <c>T</c>.</summary>
    public double[] ToRowMajor() => (double[])_t.Clone();

    /// <summary>Returns <c>T</c> as a jagged array of rows (for serialisation).</summary>
    public double[][] ToRows()
    {
        int k = Width;
        var rows = new double[k][];
        for (int i = 0; i < k; i++)
        {
            rows[i] = _t.AsSpan(i * k, k).ToArray();
        }

        return rows;
    }
}
