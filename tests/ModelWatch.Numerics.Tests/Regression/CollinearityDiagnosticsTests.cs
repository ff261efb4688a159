using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// Longley (1967, JASA 62:819–841; NIST StRD units) collinearity diagnostics against values computed with R 4.2.2
/// (TestData/References/statistics-r.out).
/// </summary>
public sealed class CollinearityDiagnosticsTests
{
    /// <summary>
    /// VIFs of Longley, Employed ~ all: the widely reported values, reproduced with car 3.1-1 <c>vif</c>
    /// (TestData/References/statistics-r.out); quoted to three decimals, so compared to 5e-4 absolute.
    /// </summary>
    [Fact]
    public void Longley_variance_inflation_factors_match_published_values()
    {
        FitSummary fit = LeastSquaresFit.Fit(NistDataset.Load("Longley").Accumulate());

        Assert.Equal(135.532, fit.VarianceInflationFactors["x1"], 0.0005);
        Assert.Equal(1788.513, fit.VarianceInflationFactors["x2"], 0.0005);
        Assert.Equal(33.619, fit.VarianceInflationFactors["x3"], 0.0005);
        Assert.Equal(3.589, fit.VarianceInflationFactors["x4"], 0.0005);
        Assert.Equal(399.151, fit.VarianceInflationFactors["x5"], 0.0005);
        Assert.Equal(758.981, fit.VarianceInflationFactors["x6"], 0.0005);
    }

    /// <summary>
    /// Belsley, Kuh &amp; Welsch (1980, Regression Diagnostics, Wiley) condition indices (unit-length columns,
    /// intercept included, not centred): 1, 9.1417, 12.2557, 25.3366, 230.4239, 1048.0803, 43275.04, from the SVD in
    /// TestData/References/statistics.R (output in statistics-r.out).
    /// </summary>
    [Fact]
    public void Longley_scaled_condition_indices_match_published_values()
    {
        FitSummary fit = LeastSquaresFit.Fit(NistDataset.Load("Longley").Accumulate());
        double[] expected = [1, 9.1417, 12.2557, 25.3366, 230.4239, 1048.0803, 43275.04];

        double[] indices = fit.SingularValues.Select(s => fit.SingularValues[0] / s).ToArray();
        for (int k = 0; k < expected.Length; k++)
        {
            Assert.Equal(expected[k], indices[k], expected[k] * 1e-5);
        }

        Assert.Equal(43275.04, fit.ConditionNumber, 0.01);
    }

    [Fact]
    public void Without_an_intercept_there_are_no_variance_inflation_factors()
    {
        FitSummary fit = LeastSquaresFit.Fit(NistDataset.Load("NoInt1").Accumulate());

        Assert.Empty(fit.VarianceInflationFactors);
    }
}
