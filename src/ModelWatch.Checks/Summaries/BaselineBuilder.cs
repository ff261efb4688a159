using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Builds a <see cref="BaselineReference"/> in one pass over reference rows: the rows stream into the
/// Householder accumulator and a seeded reservoir; once the fit is known, residuals, quantile bins and
/// leverages are derived from the reservoir. Pure and deterministic for a given seed and row order.
/// </summary>
public sealed class BaselineBuilder
{
    private readonly DesignLayout _layout;
    private readonly BaselineBuilderOptions _options;
    private readonly LeastSquaresAccumulator _accumulator;
    private readonly RowReservoir _reservoir;
    private readonly double[] _row;

    /// <summary>Creates a builder for a design.</summary>
    public BaselineBuilder(DesignLayout layout, BaselineBuilderOptions options)
    {
        ArgumentNullException.ThrowIfNull(layout);
        ArgumentNullException.ThrowIfNull(options);
        if (options.ReservoirSize is < 20 or > BaselineBuilderOptions.MaximumReservoirSize)
        {
            throw new ArgumentOutOfRangeException(nameof(options), options.ReservoirSize, $"The reservoir must hold between 20 and {BaselineBuilderOptions.MaximumReservoirSize} rows.");
        }

        _layout = layout;
        _options = options;
        _accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.RejectRow);
        _reservoir = new RowReservoir(options.ReservoirSize, options.Seed);
        _row = new double[layout.Features.Count + 1];
    }

    /// <summary>Rows accepted.</summary>
    public long RowCount => _accumulator.RowCount;

    /// <summary>Rows rejected for a non-finite value.</summary>
    public long RejectedRowCount => _accumulator.RejectedRowCount;

    /// <summary>Offers one reference row; false when it was rejected for a non-finite value.</summary>
    public bool AddRow(ReadOnlySpan<double> features, double outcome)
    {
        if (!_accumulator.AddRow(features, outcome))
        {
            return false;
        }

        features.CopyTo(_row);
        _row[^1] = outcome;
        _reservoir.Offer(_row);
        return true;
    }

    /// <summary>
    /// Completes the baseline. A fitted baseline takes the coefficients of the reference rows' fit; an imported
    /// one takes <paramref name="imported"/>'s and uses the rows (if any) for everything else.
    /// </summary>
    public BaselineReference Build(BaselineOrigin origin, ImportedCoefficients? imported = null)
    {
        int p = _layout.ParameterCount;
        AugmentedFactor? factor = RowCount > 0 ? _accumulator.ToFactor() : null;
        FitSummary? fit = factor is not null && RowCount > p ? LeastSquaresFit.Fit(factor) : null;
        double[] b0;
        double[][]? covariance;
        double[]? standardErrors;
        long n;
        double s;
        long df;
        if (origin == BaselineOrigin.Fitted)
        {
            if (imported is not null)
            {
                throw new ArgumentException("A fitted baseline takes its coefficients from the reference rows; pass no imported coefficients.", nameof(imported));
            }

            if (fit is null || !fit.IsFullRank || !(fit.ResidualDegreesOfFreedom > 0))
            {
                string why = fit?.RankDeficiency is { } rd ? string.Join("; ", rd.Reasons) : string.Create(CultureInfo.InvariantCulture, $"{RowCount} usable rows for {p} parameters");
                throw new InvalidOperationException($"Cannot fit a baseline for outcome '{_layout.Outcome}': {why}.");
            }

            b0 = fit.Coefficients.Select(c => c.Estimate!.Value).ToArray();
            covariance = ToJagged(fit.Covariance);
            standardErrors = fit.Coefficients.Select(c => c.StandardError ?? double.NaN).ToArray();
            n = RowCount;
            s = fit.ResidualStandardDeviation;
            df = fit.ResidualDegreesOfFreedom;
        }
        else
        {
            ArgumentNullException.ThrowIfNull(imported);
            b0 = _layout.Terms.Select(t => imported.Coefficients.TryGetValue(t, out double v) && double.IsFinite(v)
                ? v
                : throw new ArgumentException($"The imported coefficients lack a finite value for term '{t}'.", nameof(imported))).ToArray();
            covariance = imported.Covariance;
            if (covariance is not null && (covariance.Length != p || covariance.Any(r => r.Length != p || r.Any(v => !double.IsFinite(v)))))
            {
                throw new ArgumentException($"The imported covariance must be a finite {p}×{p} matrix in term order ({string.Join(", ", _layout.Terms)}).", nameof(imported));
            }

            standardErrors = covariance is not null
                ? Enumerable.Range(0, p).Select(i => Math.Sqrt(covariance[i][i])).ToArray()
                : imported.StandardErrors is { } se && _layout.Terms.All(t => se.TryGetValue(t, out double v) && double.IsFinite(v) && v >= 0)
                    ? _layout.Terms.Select(t => se[t]).ToArray()
                    : null;
            n = imported.RowCount ?? RowCount;
            (s, df) = ImportedSpread(imported, factor, fit, b0);
        }

        return Complete(origin, factor, fit, b0, covariance, standardErrors, n, s, df);
    }

    private (double S, long Df) ImportedSpread(ImportedCoefficients imported, AugmentedFactor? factor, FitSummary? fit, double[] b0)
    {
        if (imported.ResidualStandardDeviation is { } given)
        {
            if (!(given > 0) || !double.IsFinite(given))
            {
                throw new ArgumentException($"The imported residual standard deviation must be positive and finite, got {given.ToString(CultureInfo.InvariantCulture)}.", nameof(imported));
            }

            return (given, imported.ResidualDegreesOfFreedom ?? Math.Max(1, (imported.RowCount ?? RowCount) - _layout.ParameterCount));
        }

        if (factor is null || fit is null || !fit.IsFullRank)
        {
            throw new ArgumentException($"An imported baseline for outcome '{_layout.Outcome}' needs a residual standard deviation or full-rank reference rows to estimate it.", nameof(imported));
        }

        // RSS of b0 on the reference rows = RSS of their fit + ‖R(b̂ − b0)‖² (orthogonality of the fit's residuals).
        double[] bHat = fit.Coefficients.Select(c => c.Estimate!.Value).ToArray();
        double extra = 0.0;
        int p = _layout.ParameterCount;
        for (int i = 0; i < p; i++)
        {
            double v = 0.0;
            for (int j = i; j < p; j++)
            {
                v += factor[i, j] * (bHat[j] - b0[j]);
            }

            extra += v * v;
        }

        long df = RowCount - p;
        return (Math.Sqrt((fit.ResidualSumOfSquares + extra) / df), df);
    }

    private BaselineReference Complete(BaselineOrigin origin, AugmentedFactor? factor, FitSummary? fit, double[] b0, double[][]? covariance, double[]? standardErrors, long n, double s, long df)
    {
        int q = _layout.Features.Count;
        List<double[]> rows = _reservoir.InOrder();
        double[,]? r = fit is { IsFullRank: true } && factor is not null ? TopLeft(factor, _layout.ParameterCount) : null;
        var x = new double[_layout.ParameterCount];
        var residuals = new double[rows.Count];
        var raw = new double[rows.Count];
        var leverages = new double[rows.Count];
        for (int i = 0; i < rows.Count; i++)
        {
            DesignRow.Fill(_layout, rows[i], x);
            double e = rows[i][q] - DesignRow.Dot(x, b0);
            raw[i] = e;
            double h = r is null ? double.NaN : DesignRow.Leverage(r, x);
            residuals[i] = origin == BaselineOrigin.Fitted && r is not null ? e / (s * Math.Sqrt(Math.Max(1e-12, 1.0 - h))) : e / s;

            // Leave-one-out leverage h/(1 − h) is the leverage a reference row would have as a new row against the
            // others, so reference and window leverages are exchangeable under no change (Sherman–Morrison).
            leverages[i] = h < 1.0 - 1e-12 ? h / (1.0 - h) : 1e12;
        }

        double[][] featureSamples = Enumerable.Range(0, q).Select(j => rows.Select(row => row[j]).ToArray()).ToArray();
        var bins = featureSamples.Select((values, j) => QuantileBins.Of(_layout.Features[j], values, _options.Bins)).ToList();
        double? threshold = null;
        int exceed = 0;
        var quantiles = new Dictionary<string, double>(StringComparer.Ordinal);
        double? maxLeverage = null;
        if (r is not null && rows.Count > 0)
        {
            double[] sorted = leverages.OrderBy(v => v).ToArray();
            threshold = EmpiricalQuantile.OfSorted(sorted, _options.LeverageQuantile);
            exceed = sorted.Count(v => v > threshold.Value);
            maxLeverage = sorted[^1];
            foreach ((string name, double prob) in new[] { ("p50", 0.5), ("p90", 0.9), ("p95", 0.95), ("p99", 0.99) })
            {
                quantiles[name] = EmpiricalQuantile.OfSorted(sorted, prob);
            }
        }

        StatisticalTest? koenker = null;
        if (r is not null && q > 0 && rows.Count > _layout.ParameterCount + 2)
        {
            koenker = Heteroscedasticity.Koenker(rows.Select(row => row[..q]).ToArray(), raw);
        }

        // The document must stay valid JSON, so statistics that do not exist are left out rather than NaN.
        double[] means = factor is null ? [] : Enumerable.Range(0, q).Select(j => factor.Columns[j].Mean).ToArray();
        double[] sds = rows.Count < 2 ? [] : featureSamples.Select(StandardDeviation).ToArray();
        bool usableFit = fit is { IsFullRank: true };
        var coefficients = new Dictionary<string, double>(StringComparer.Ordinal);
        for (int j = 0; j < b0.Length; j++)
        {
            coefficients[_layout.Terms[j]] = b0[j];
        }

        return new BaselineReference
        {
            Fingerprint = Fingerprint(origin, b0, n, s, rows.Count),
            Origin = origin,
            Features = _layout.Features,
            Outcome = _layout.Outcome,
            Intercept = _layout.Intercept,
            Coefficients = coefficients,
            Covariance = covariance,
            StandardErrors = standardErrors,
            RowCount = n,
            ResidualStandardDeviation = s,
            ResidualDegreesOfFreedom = df,
            Factor = factor?.ToRows(),
            FactorRowCount = factor?.RowCount ?? 0,
            OutcomeMean = factor?.Columns.Count > q ? factor.Columns[q].Mean : null,
            FeatureMeans = means,
            FeatureStandardDeviations = sds,
            FeatureBins = rows.Count >= _options.Bins ? bins : [],
            SampleSize = rows.Count,
            Seed = _options.Seed,
            ResidualSample = residuals,
            FeatureSamples = featureSamples,
            LeverageThreshold = threshold,
            LeverageExceedanceCount = exceed,
            LeverageExceedanceShare = threshold is null ? null : (double)exceed / rows.Count,
            MaximumLeverage = maxLeverage,
            LeverageQuantiles = quantiles,
            ConditionNumber = usableFit ? fit!.ConditionNumber : null,
            VarianceInflationFactors = usableFit ? fit!.VarianceInflationFactors.Where(kv => double.IsFinite(kv.Value)).ToDictionary(kv => kv.Key, kv => kv.Value, StringComparer.Ordinal) : new Dictionary<string, double>(),
            HeteroscedasticityPValue = koenker is { } k1 && double.IsFinite(k1.PValue) ? k1.PValue : null,
            HeteroscedasticityStatistic = koenker is { } k2 && double.IsFinite(k2.Statistic) ? k2.Statistic : null,
        };
    }

    private static double StandardDeviation(double[] values)
    {
        if (values.Length < 2)
        {
            return double.NaN;
        }

        double mean = values.Average();
        return Math.Sqrt(values.Sum(a => (a - mean) * (a - mean)) / (values.Length - 1));
    }

    private static double[,] TopLeft(AugmentedFactor factor, int p)
    {
        var r = new double[p, p];
        for (int i = 0; i < p; i++)
        {
            for (int j = i; j < p; j++)
            {
                r[i, j] = factor[i, j];
            }
        }

        return r;
    }

    private static double[][] ToJagged(double[,] m) =>
        Enumerable.Range(0, m.GetLength(0)).Select(i => Enumerable.Range(0, m.GetLength(1)).Select(j => m[i, j]).ToArray()).ToArray();

    private static string Fingerprint(BaselineOrigin origin, double[] b0, long n, double s, int sample)
    {
        var text = new StringBuilder();
        text.Append(CultureInfo.InvariantCulture, $"{origin}|{n}|{s:R}|{sample}");
        foreach (double b in b0)
        {
            text.Append(CultureInfo.InvariantCulture, $"|{b:R}");
        }

        return Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text.ToString())))[..32];
    }
}
