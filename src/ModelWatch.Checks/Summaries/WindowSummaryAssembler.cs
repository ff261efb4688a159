using ModelWatch.Numerics.Regression;

namespace ModelWatch.Checks.Summaries;

/// <summary>Turns a builder's running state into a <see cref="WindowSummary"/>.</summary>
internal static class WindowSummaryAssembler
{
    public static WindowSummary Assemble(WindowSummaryBuilder builder)
    {
        DesignLayout layout = builder.Layout;
        BaselineReference baseline = builder.Baseline;
        LeastSquaresAccumulator accumulator = builder.Accumulator;
        int p = layout.ParameterCount;
        int q = layout.Features.Count;
        AugmentedFactor? factor = accumulator.RowCount > 0 ? accumulator.ToFactor() : null;
        FitSummary? fit = factor is not null && accumulator.RowCount > p ? LeastSquaresFit.Fit(factor) : null;
        IReadOnlyList<ColumnSummary> columns = factor?.Columns ?? accumulator.Columns;

        List<double[]> rows = builder.Reservoir.InOrder();
        double s = baseline.ResidualStandardDeviation;
        double[] b0 = builder.DeployedCoefficients;
        double[]? bHat = fit is { IsFullRank: true } ? fit.Coefficients.Select(c => c.Estimate!.Value).ToArray() : null;
        var x = new double[p];
        var work = new double[p];
        var standardized = new double[rows.Count];
        var refit = bHat is null ? [] : new double[rows.Count];
        for (int i = 0; i < rows.Count; i++)
        {
            DesignRow.Fill(layout, rows[i], x);
            double e = rows[i][q] - DesignRow.Dot(x, b0);
            double h = builder.ReferencePackedR is { } r ? DesignRow.Leverage(r, x, work) : 0.0;
            standardized[i] = e / (s * Math.Sqrt(1.0 + h));
            if (bHat is not null)
            {
                refit[i] = rows[i][q] - DesignRow.Dot(x, bHat);
            }
        }

        LagSums lags = builder.Lags;
        int maxLag = (int)Math.Min(builder.Options.MaximumLag, Math.Max(0, lags.Count - 1));
        (double sumSquares, double sumAbs, double outcomeDeviation) = builder.Sums;
        (long exceed, long aboveMax, double maxLeverage) = builder.Leverage;
        (long servedCount, long mismatch, double servedMax, double servedSum) = builder.Served;
        var nonFinite = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (ColumnSummary column in accumulator.Columns.Where(c => c.NonFiniteCount > 0))
        {
            nonFinite[column.Name] = column.NonFiniteCount;
        }

        LeastSquaresAccumulator newRows = builder.NewRowsAccumulator;
        return new WindowSummary
        {
            RowsRead = accumulator.RowCount + accumulator.RejectedRowCount,
            RowsAccepted = accumulator.RowCount,
            RowsRejected = accumulator.RejectedRowCount,
            NonFiniteByColumn = nonFinite,
            ConstantFeatures = columns.Take(q).Where(c => c.IsConstant).Select(c => c.Name).ToList(),
            Columns = columns,
            Factor = factor,
            Fit = fit,
            FeatureMeans = columns.Take(q).Select(c => c.Mean).ToArray(),
            DeployedErrorSum = lags.Sum,
            DeployedErrorSumOfSquares = sumSquares,
            DeployedAbsoluteErrorSum = sumAbs,
            OutcomeDeviationSumOfSquares = baseline.OutcomeMean is null ? double.NaN : outcomeDeviation,
            Autocorrelations = maxLag >= 1 ? lags.Autocorrelations(maxLag) : [],
            DurbinWatson = lags.DurbinWatson(),
            FeatureBinCounts = builder.BinCounts.Select(c => (long[])c.Clone()).ToArray(),
            NewRowsFeatureBinCounts = builder.NewBinCounts.Select(c => (long[])c.Clone()).ToArray(),
            NewRowsLeverageExceedanceCount = builder.NewLeverageExceedanceCount,
            LeverageComputed = builder.ReferencePackedR is not null,
            LeverageExceedanceCount = exceed,
            LeverageAboveReferenceMaximumCount = aboveMax,
            MaximumLeverage = maxLeverage,
            SampleSize = rows.Count,
            ResidualSample = standardized,
            RefitResidualSample = refit,
            FeatureSamples = Enumerable.Range(0, q).Select(j => rows.Select(r => r[j]).ToArray()).ToArray(),
            ServedCount = servedCount,
            ServedMismatchCount = mismatch,
            ServedMaximumDifference = servedMax,
            ServedMeanDifference = servedCount == 0 ? double.NaN : servedSum / servedCount,
            NewRows = newRows.RowCount > 0 ? newRows.ToFactor() : null,
        };
    }
}
