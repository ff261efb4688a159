using ModelWatch.Numerics.Regression;
using Xunit.Abstractions;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// The streaming Householder fit against the NIST StRD certified values (TestData/NistStrd). Accuracy is the
/// log relative error (LRE, correct significant digits) of every certified quantity, two-sided.
/// </summary>
public sealed class NistStrdTests(ITestOutputHelper output)
{
    /// <summary>
    /// Lower- and average-difficulty sets, Longley and Wampler1–3: at least 9 correct digits for every estimate,
    /// standard deviation, residual SD and R² (our target: an unpivoted Householder QR in double precision reaches
    /// 9.0 or better on these).
    /// </summary>
    [Theory]
    [InlineData("Norris")]
    [InlineData("Pontius")]
    [InlineData("NoInt1")]
    [InlineData("NoInt2")]
    [InlineData("Longley")]
    [InlineData("Wampler1")]
    [InlineData("Wampler2")]
    [InlineData("Wampler3")]
    public void Certified_values_reach_nine_digits(string name)
    {
        var data = NistDataset.Load(name);
        FitSummary fit = LeastSquaresFit.Fit(data.Accumulate());

        Report(data, fit);
        Assert.True(fit.IsFullRank, $"{name} must be full rank");
        double[] estimates = data.CertifiedEstimates;
        double[] deviations = data.CertifiedStandardDeviations;
        for (int j = 0; j < estimates.Length; j++)
        {
            Assert.True(Lre.Of(fit.Coefficients[j].Estimate!.Value, estimates[j]) >= 9.0, $"{name} estimate {j}");
            Assert.True(Lre.Of(fit.Coefficients[j].StandardError!.Value, deviations[j]) >= 9.0, $"{name} std dev {j}");
        }

        Assert.True(Lre.Of(fit.ResidualStandardDeviation, data.CertifiedResidualSd) >= 9.0, $"{name} residual SD");
        Assert.True(Lre.Of(fit.RSquared, data.CertifiedRSquared) >= 9.0, $"{name} R²");
    }

    /// <summary>
    /// The three hardest sets: LAPACK's Householder QR (through NumPy, measured when this test was written) gets
    /// 7.2 (Filip), 8.1 (Wampler4) and 6.1 (Wampler5) digits on the estimates; the floor asked here is that less 0.3.
    /// </summary>
    [Theory]
    [InlineData("Filip", 7.0)]
    [InlineData("Wampler4", 7.8)]
    [InlineData("Wampler5", 5.8)]
    public void Hardest_sets_match_lapack_householder_accuracy(string name, double minimumDigits)
    {
        var data = NistDataset.Load(name);
        FitSummary fit = LeastSquaresFit.Fit(data.Accumulate());

        Report(data, fit);
        Assert.True(fit.IsFullRank, $"{name} must be fitted, not declared rank-deficient");
        double[] estimates = data.CertifiedEstimates;
        for (int j = 0; j < estimates.Length; j++)
        {
            Assert.True(Lre.Of(fit.Coefficients[j].Estimate!.Value, estimates[j]) >= minimumDigits, $"{name} estimate {j}");
        }
    }

    [Fact]
    public void Filip_is_fitted_with_a_conditioning_warning()
    {
        FitSummary fit = LeastSquaresFit.Fit(NistDataset.Load("Filip").Accumulate());

        Assert.Equal(11, fit.Rank);
        Assert.Null(fit.RankDeficiency);
        Assert.Contains(fit.Warnings, w => w.Contains("ill-conditioned", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData("Norris")]
    [InlineData("Longley")]
    [InlineData("NoInt1")]
    [InlineData("Pontius")]
    public void F_statistic_and_residual_sum_of_squares_match_the_certified_anova(string name)
    {
        var data = NistDataset.Load(name);
        FitSummary fit = LeastSquaresFit.Fit(data.Accumulate());

        Assert.True(Lre.Of(fit.ResidualSumOfSquares, data.CertifiedRss) >= 9.0);
        Assert.True(Lre.Of(fit.FStatistic, data.CertifiedF!.Value) >= 9.0);
    }

    [Theory]
    [InlineData("Wampler1")]
    [InlineData("Wampler2")]
    public void Exact_fits_have_infinite_certified_F(string name)
    {
        var data = NistDataset.Load(name);
        FitSummary fit = LeastSquaresFit.Fit(data.Accumulate());

        // NIST prints F = Infinity for these exact fits; a double computation gives a huge or infinite value.
        Assert.Null(data.CertifiedF);
        Assert.True(fit.FStatistic > 1e20 || double.IsPositiveInfinity(fit.FStatistic));
    }

    private void Report(NistDataset data, FitSummary fit)
    {
        double[] estimates = data.CertifiedEstimates;
        double[] deviations = data.CertifiedStandardDeviations;
        double minEstimate = Enumerable.Range(0, estimates.Length).Min(j => Lre.Of(fit.Coefficients[j].Estimate ?? double.NaN, estimates[j]));
        double minSd = Enumerable.Range(0, deviations.Length).Min(j => Lre.Of(fit.Coefficients[j].StandardError ?? double.NaN, deviations[j]));
        output.WriteLine(
            $"{data.Name}: LRE estimates {minEstimate:F1}, std devs {minSd:F1}, residual SD {Lre.Of(fit.ResidualStandardDeviation, data.CertifiedResidualSd):F1}, " +
            $"R² {Lre.Of(fit.RSquared, data.CertifiedRSquared):F1}; scaled condition number {fit.ConditionNumber:G3}");
    }
}
