using System.Text.Json.Serialization;
using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Everything the checks compare a window against, frozen when the baseline is registered. A plain immutable
/// document (System.Text.Json round-trips it), versioned by <see cref="SchemaVersion"/>. Parts an imported
/// baseline may lack are nullable or empty; a test that needs them reports <c>skipped</c>.
/// </summary>
public sealed class BaselineReference
{
    /// <summary>Version of this document's shape.</summary>
    public const int CurrentSchemaVersion = 1;

    /// <summary>Version of this document's shape (see <see cref="CurrentSchemaVersion"/>).</summary>
    public int SchemaVersion { get; init; } = CurrentSchemaVersion;

    /// <summary>Hash of the coefficients, counts and reference statistics; a new value resets sequential state.</summary>
    public required string Fingerprint { get; init; }

    /// <summary>Where the coefficients came from.</summary>
    public required BaselineOrigin Origin { get; init; }

    /// <summary>Feature columns in design order.</summary>
    public required IReadOnlyList<string> Features { get; init; }

    /// <summary>The outcome column.</summary>
    public required string Outcome { get; init; }

    /// <summary>Whether the design has an intercept.</summary>
    public required bool Intercept { get; init; }

    /// <summary>Deployed coefficients by term.</summary>
    public required IReadOnlyDictionary<string, double> Coefficients { get; init; }

    /// <summary>Coefficient covariance, p×p in term order; null when an imported baseline did not carry it.</summary>
    public double[][]? Covariance { get; init; }

    /// <summary>Standard errors in term order; null when unknown.</summary>
    public double[]? StandardErrors { get; init; }

    /// <summary>Reference rows <c>n</c> (training rows for an imported baseline when known, else the reference window's).</summary>
    public required long RowCount { get; init; }

    /// <summary>Reference residual standard deviation <c>s_ref</c>.</summary>
    public required double ResidualStandardDeviation { get; init; }

    /// <summary>Degrees of freedom of <see cref="ResidualStandardDeviation"/>.</summary>
    public required long ResidualDegreesOfFreedom { get; init; }

    /// <summary>Sign-normalised factor T of the reference rows' <c>[X | y]</c>, as rows; null with no reference rows.</summary>
    public double[][]? Factor { get; init; }

    /// <summary>Rows folded into <see cref="Factor"/>.</summary>
    public long FactorRowCount { get; init; }

    /// <summary>Mean outcome of the reference rows (benchmark of the out-of-sample R²); null when unknown.</summary>
    public double? OutcomeMean { get; init; }

    /// <summary>Reference feature means in design order (empty when unknown).</summary>
    public IReadOnlyList<double> FeatureMeans { get; init; } = [];

    /// <summary>Reference feature standard deviations in design order (empty when unknown).</summary>
    public IReadOnlyList<double> FeatureStandardDeviations { get; init; } = [];

    /// <summary>Quantile bins per feature (empty when unknown).</summary>
    public IReadOnlyList<FeatureBins> FeatureBins { get; init; } = [];

    /// <summary>Rows of the reservoir sample behind bins, residual and feature samples and leverages.</summary>
    public int SampleSize { get; init; }

    /// <summary>Seed of the reservoir.</summary>
    public int Seed { get; init; }

    /// <summary>
    /// Standardized reference residuals of the deployed coefficients on the reservoir rows:
    /// <c>e/(s_ref √(1 − h))</c> for a fitted baseline (studentized), <c>e/s_ref</c> for an imported one.
    /// </summary>
    public IReadOnlyList<double> ResidualSample { get; init; } = [];

    /// <summary>Reservoir values per feature (design order), for two-sample tests.</summary>
    public IReadOnlyList<double[]> FeatureSamples { get; init; } = [];

    /// <summary>
    /// <see cref="ResidualSample"/> sorted ascending. A baseline never changes and the daemon keeps it in memory across
    /// runs, so the rank tests sort its thousands of reference values once, not on every run.
    /// </summary>
    [JsonIgnore]
    public double[] SortedResidualSample => _sortedResidualSample ??= SortedSample.Of(ResidualSample);

    /// <summary><see cref="FeatureSamples"/>, each sorted ascending (see <see cref="SortedResidualSample"/>).</summary>
    [JsonIgnore]
    public IReadOnlyList<double[]> SortedFeatureSamples => _sortedFeatureSamples ??= [.. FeatureSamples.Select(SortedSample.Of)];

    // Filled on first use; two threads racing compute equal arrays, so either may win.
    private double[]? _sortedResidualSample;
    private double[][]? _sortedFeatureSamples;
    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, Lazy<object>> _derived = new(StringComparer.Ordinal);

    /// <summary>
    /// A value derived from this baseline alone (a resampled null spread, say), computed once per key and kept with the
    /// baseline: the daemon keeps baselines in memory across runs, and the value never changes with the window.
    /// </summary>
    internal T Derived<T>(string key, Func<BaselineReference, T> factory)
        where T : class =>
        (T)_derived.GetOrAdd(key, _ => new Lazy<object>(() => factory(this))).Value;

    /// <summary>
    /// Leverage <c>xᵀ(X_refᵀX_ref)⁻¹x</c> above which a window row counts as an extrapolation: the reference quantile of
    /// the reservoir rows' leave-one-out leverages <c>h/(1 − h)</c>, which are exchangeable with new rows' leverages.
    /// Null without a factor.
    /// </summary>
    public double? LeverageThreshold { get; init; }

    /// <summary>Reservoir rows whose leverage exceeds <see cref="LeverageThreshold"/>.</summary>
    public int LeverageExceedanceCount { get; init; }

    /// <summary>Share of reference rows above <see cref="LeverageThreshold"/> (about 1 % by construction).</summary>
    public double? LeverageExceedanceShare { get; init; }

    /// <summary>Largest leave-one-out leverage among the reservoir rows.</summary>
    public double? MaximumLeverage { get; init; }

    /// <summary>Reference leverage quantiles by name ("p50", "p90", "p95", "p99").</summary>
    public IReadOnlyDictionary<string, double> LeverageQuantiles { get; init; } = new Dictionary<string, double>();

    /// <summary>BKW-scaled condition number of the reference design; null without a factor.</summary>
    public double? ConditionNumber { get; init; }

    /// <summary>Reference VIFs by feature.</summary>
    public IReadOnlyDictionary<string, double> VarianceInflationFactors { get; init; } = new Dictionary<string, double>();

    /// <summary>Koenker's studentized Breusch–Pagan p-value on the reference sample; null when not computed.</summary>
    public double? HeteroscedasticityPValue { get; init; }

    /// <summary>Koenker's LM statistic on the reference sample.</summary>
    public double? HeteroscedasticityStatistic { get; init; }

    /// <summary>The design layout.</summary>
    public DesignLayout ToLayout() => new(Features, Outcome, Intercept);

    /// <summary>Coefficients in term order.</summary>
    public double[] CoefficientVector()
    {
        DesignLayout layout = ToLayout();
        return layout.Terms.Select(t => Coefficients.TryGetValue(t, out double v)
            ? v
            : throw new InvalidOperationException($"The baseline has no coefficient for term '{t}'.")).ToArray();
    }

    /// <summary>The reference factor as an <see cref="AugmentedFactor"/>, or null.</summary>
    public AugmentedFactor? ToFactor()
    {
        if (Factor is null)
        {
            return null;
        }

        DesignLayout layout = ToLayout();
        return AugmentedFactor.FromRowMajor(layout, FactorRowCount, Factor.SelectMany(r => r).ToArray());
    }

    /// <summary>Covariance as a 2-D array, or null.</summary>
    public double[,]? CovarianceMatrix()
    {
        if (Covariance is null)
        {
            return null;
        }

        int p = Covariance.Length;
        var c = new double[p, p];
        for (int i = 0; i < p; i++)
        {
            for (int j = 0; j < p; j++)
            {
                c[i, j] = Covariance[i][j];
            }
        }

        return c;
    }
}
