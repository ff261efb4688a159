using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Summarises a window's rows against a baseline in one pass, in time order. Builders over consecutive
/// sub-ranges merge exactly (factor, counts, sums, lag products) except the reservoir, which merges by
/// weighted sampling. Not thread-safe: one per reader.
/// </summary>
public sealed class WindowSummaryBuilder
{
    private readonly DesignLayout _layout;
    private readonly BaselineReference _baseline;
    private readonly WindowSummaryOptions _options;
    private readonly LeastSquaresAccumulator _accumulator;
    private LeastSquaresAccumulator? _newRows;
    private readonly RowReservoir _reservoir;
    private readonly LagSums _lags;
    private readonly double[] _b0;
    private readonly double[]? _rPacked;
    private readonly long[][] _binCounts;
    private readonly long[][] _newBinCounts;
    private readonly double[] _x;
    private readonly double[] _work;
    private readonly double[] _row;
    private readonly double _outcomeMean;
    private double _sumSquares;
    private double _sumAbs;
    private double _outcomeDeviation;
    private long _leverageExceed;
    private long _leverageAboveMax;
    private long _newLeverageExceed;
    private double _maxLeverage = double.NaN;
    private long _servedCount;
    private long _servedMismatch;
    private double _servedMax;
    private double _servedSum;

    /// <summary>Creates a builder; the layout must match the baseline's.</summary>
    public WindowSummaryBuilder(DesignLayout layout, BaselineReference baseline, WindowSummaryOptions options)
    {
        ArgumentNullException.ThrowIfNull(layout);
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(options);
        if (!layout.Features.SequenceEqual(baseline.Features, StringComparer.Ordinal) || layout.Outcome != baseline.Outcome || layout.Intercept != baseline.Intercept)
        {
            throw new ArgumentException(
                $"The window's design ({layout.Outcome} ~ {string.Join(" + ", layout.Terms)}) does not match the baseline's ({baseline.Outcome} ~ {string.Join(" + ", baseline.ToLayout().Terms)}).",
                nameof(layout));
        }

        _layout = layout;
        _baseline = baseline;
        _options = options;
        _accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.RejectRow);
        _reservoir = new RowReservoir(options.ReservoirSize, options.Seed);
        _lags = new LagSums(options.MaximumLag);
        _b0 = baseline.CoefficientVector();
        AugmentedFactor? reference = baseline.ToFactor();
        if (reference is not null && baseline.LeverageThreshold is not null)
        {
            _rPacked = DesignRow.PackUpperColumns(reference, layout.ParameterCount);
        }

        _binCounts = baseline.FeatureBins.Select(b => new long[b.Proportions.Length]).ToArray();
        _newBinCounts = baseline.FeatureBins.Select(b => new long[b.Proportions.Length]).ToArray();
        _x = new double[layout.ParameterCount];
        _work = new double[layout.ParameterCount];
        _row = new double[layout.Features.Count + 1];
        _outcomeMean = baseline.OutcomeMean ?? double.NaN;
    }

    /// <summary>Rows accepted so far.</summary>
    public long RowCount => _accumulator.RowCount;

    /// <summary>Offers a row that is new since the previous run.</summary>
    public bool AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction = null) =>
        AddRow(features, outcome, servedPrediction, newSinceLastRun: true);

    /// <summary>
    /// Offers a row; <paramref name="newSinceLastRun"/> false marks a row an earlier run already consumed (an
    /// overlapping window), which the sequential statistics must not count twice. False when rejected.
    /// </summary>
    public bool AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool newSinceLastRun)
    {
        // While every row is new, the new rows are exactly the accumulator's and a second accumulator would only repeat
        // its work; the first row an earlier run saw starts a separate one holding the (new) rows before it.
        if (!newSinceLastRun && _newRows is null)
        {
            _newRows = SeparateNewRows(_accumulator);
        }

        if (!_accumulator.AddRow(features, outcome))
        {
            return false;
        }

        if (newSinceLastRun && _newRows is not null)
        {
            _newRows.AddRow(features, outcome);
        }

        DesignRow.Fill(_layout, features, _x);
        double predicted = DesignRow.Dot(_x, _b0);
        double e = outcome - predicted;
        _lags.Add(e);
        _sumSquares += e * e;
        _sumAbs += Math.Abs(e);
        _outcomeDeviation += (outcome - _outcomeMean) * (outcome - _outcomeMean);
        if (_rPacked is not null)
        {
            double h = DesignRow.Leverage(_rPacked, _x, _work);
            long exceeds = h > _baseline.LeverageThreshold!.Value ? 1 : 0;
            _leverageExceed += exceeds;
            _newLeverageExceed += newSinceLastRun ? exceeds : 0;
            _leverageAboveMax += h > _baseline.MaximumLeverage!.Value ? 1 : 0;
            _maxLeverage = double.IsNaN(_maxLeverage) ? h : Math.Max(_maxLeverage, h);
        }

        for (int j = 0; j < _binCounts.Length; j++)
        {
            int bin = _baseline.FeatureBins[j].BinOf(features[j]);
            _binCounts[j][bin]++;
            if (newSinceLastRun)
            {
                _newBinCounts[j][bin]++;
            }
        }

        if (servedPrediction is { } served && double.IsFinite(served))
        {
            double diff = served - predicted;
            _servedCount++;
            _servedSum += diff;
            _servedMax = Math.Max(_servedMax, Math.Abs(diff));
            _servedMismatch += Math.Abs(diff) > _options.ServedTolerance * Math.Max(1.0, Math.Abs(predicted)) ? 1 : 0;
        }

        features.CopyTo(_row);
        _row[^1] = outcome;
        _reservoir.Offer(_row);
        return true;
    }

    /// <summary>Folds in a builder over the rows that follow this one's (same baseline and options).</summary>
    public void Merge(WindowSummaryBuilder other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (!ReferenceEquals(other._baseline, _baseline) && other._baseline.Fingerprint != _baseline.Fingerprint)
        {
            throw new ArgumentException("Window summaries against different baselines cannot be merged.", nameof(other));
        }

        if (other._options.MaximumLag != _options.MaximumLag || ReferenceEquals(other, this))
        {
            throw new ArgumentException("Only a distinct builder with the same maximum lag can be merged.", nameof(other));
        }

        if (_newRows is not null || other._newRows is not null)
        {
            _newRows ??= SeparateNewRows(_accumulator);
            _newRows.Merge(other.NewRowsAccumulator);
        }

        _accumulator.Merge(other._accumulator);
        _lags.MergeFollowing(other._lags);
        _reservoir.MergeFollowing(other._reservoir);
        _sumSquares += other._sumSquares;
        _sumAbs += other._sumAbs;
        _outcomeDeviation += other._outcomeDeviation;
        _leverageExceed += other._leverageExceed;
        _leverageAboveMax += other._leverageAboveMax;
        _newLeverageExceed += other._newLeverageExceed;
        _maxLeverage = double.IsNaN(_maxLeverage) ? other._maxLeverage : double.IsNaN(other._maxLeverage) ? _maxLeverage : Math.Max(_maxLeverage, other._maxLeverage);
        for (int j = 0; j < _binCounts.Length; j++)
        {
            for (int b = 0; b < _binCounts[j].Length; b++)
            {
                _binCounts[j][b] += other._binCounts[j][b];
                _newBinCounts[j][b] += other._newBinCounts[j][b];
            }
        }

        _servedCount += other._servedCount;
        _servedMismatch += other._servedMismatch;
        _servedSum += other._servedSum;
        _servedMax = Math.Max(_servedMax, other._servedMax);
    }

    /// <summary>A new-rows accumulator holding a copy of <paramref name="allNew"/>, every row of which is new.</summary>
    private LeastSquaresAccumulator SeparateNewRows(LeastSquaresAccumulator allNew)
    {
        var separate = new LeastSquaresAccumulator(_layout, NonFiniteValuePolicy.RejectRow);
        if (allNew.RowCount > 0)
        {
            separate.Merge(allNew);
        }

        return separate;
    }

    /// <summary>Completes the summary.</summary>
    public WindowSummary Build() => WindowSummaryAssembler.Assemble(this);

    internal DesignLayout Layout => _layout;

    internal BaselineReference Baseline => _baseline;

    internal WindowSummaryOptions Options => _options;

    internal LeastSquaresAccumulator Accumulator => _accumulator;

    internal LeastSquaresAccumulator NewRowsAccumulator => _newRows ?? _accumulator;

    internal RowReservoir Reservoir => _reservoir;

    internal LagSums Lags => _lags;

    internal double[] DeployedCoefficients => _b0;

    internal double[]? ReferencePackedR => _rPacked;

    internal long[][] BinCounts => _binCounts;

    internal long[][] NewBinCounts => _newBinCounts;

    internal long NewLeverageExceedanceCount => _newLeverageExceed;

    internal (double SumSquares, double SumAbs, double OutcomeDeviation) Sums => (_sumSquares, _sumAbs, _outcomeDeviation);

    internal (long Exceed, long AboveMax, double Max) Leverage => (_leverageExceed, _leverageAboveMax, _maxLeverage);

    internal (long Count, long Mismatch, double Max, double Sum) Served => (_servedCount, _servedMismatch, _servedMax, _servedSum);
}
