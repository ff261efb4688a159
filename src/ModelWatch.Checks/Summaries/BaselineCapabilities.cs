namespace ModelWatch.Checks.Summaries;

/// <summary>
/// Which tests a baseline lets run. Each line mirrors the condition under which a check reports <c>skipped</c> with
/// <c>baseline_incomplete</c> (or, for collinearity, cannot compare with the reference), so an operator learns what an
/// imported baseline without reference rows leaves unwatched when it is stored, not from a run's findings later.
/// Keep it in step with the checks' own guards.
/// </summary>
public static class BaselineCapabilities
{
    /// <summary>Below this many reference draws the rank tests do not run (the checks' own minimum).</summary>
    private const int MinimumSample = 20;

    /// <summary>Every group of tests, with whether <paramref name="baseline"/> enables it.</summary>
    public static IReadOnlyList<BaselineCapability> Of(BaselineReference baseline)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        int q = baseline.Features.Count;
        bool factor = baseline.Factor is not null;
        bool featureSamples = q > 0 && baseline.FeatureSamples.Count == q && baseline.SampleSize >= MinimumSample;
        return
        [
            new("residuals: shape (Kolmogorov–Smirnov, Anderson–Darling) and spread (Brown–Forsythe)", "reference residual sample",
                baseline.ResidualSample.Count >= MinimumSample, true),
            new("coefficients: Chow test; error: Chow's predictive F", "reference factor", factor, true),
            new("coefficients and residuals: sequential CUSUMs", "reference factor", factor, true),
            new("features: population stability index and bin-share CUSUMs", "feature quantile bins", q > 0 && baseline.FeatureBins.Count == q, true),
            new("features: two-sample Kolmogorov–Smirnov", "reference feature samples", featureSamples, true),
            new("features: mean CUSUMs", "reference feature means and standard deviations",
                q > 0 && baseline.FeatureMeans.Count == q && baseline.FeatureStandardDeviations.Count == q, true),
            new("features: extrapolation (leverage exceedance)", "reference leverage quantiles", baseline.LeverageExceedanceShare is not null, true),
            new("collinearity: growth against the reference condition number and VIFs, with its resampled null", "reference condition number and feature samples",
                baseline.ConditionNumber is not null && featureSamples, true),
            new("coefficients: Wald test; residuals: bias test", "coefficient covariance", baseline.Covariance is not null, false),
            new("coefficients: per-coefficient z tests", "coefficient standard errors", baseline.Covariance is not null || baseline.StandardErrors is not null, false),
        ];
    }
}
