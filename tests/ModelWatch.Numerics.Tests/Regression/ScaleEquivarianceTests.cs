using ModelWatch.Numerics.Regression;
using Xunit.Abstractions;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// A least-squares fit is scale-equivariant: multiplying column j by c_j and the outcome by c_y multiplies coefficient j
/// by c_y / c_j, its standard error likewise, the residual SD by c_y, and leaves R² alone. With powers of two the data
/// are scaled exactly, so the fit must give the same digits exactly; with 1e±150 the NIST certified values (TestData/
/// NistStrd) scale by the same factors and are checked by their log relative error.
/// </summary>
public sealed class ScaleEquivarianceTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData("Norris", 500, -300)]
    [InlineData("Longley", -300, 400)]
    [InlineData("Wampler1", 300, -600)]
    [InlineData("Filip", -450, 450)]
    [InlineData("NoInt1", 500, -500)]
    public void Powers_of_two_give_the_same_digits_exactly(string name, int featurePower, int outcomePower)
    {
        NistDataset data = NistDataset.Load(name);
        FitSummary plain = LeastSquaresFit.Fit(data.Accumulate());

        // Each feature gets its own power (featurePower + j), the outcome another: every column on its own scale.
        FitSummary scaled = LeastSquaresFit.Fit(Accumulate(data, j => Math.ScaleB(1.0, featurePower + j), Math.ScaleB(1.0, outcomePower)));

        for (int j = 0; j < data.Layout.ParameterCount; j++)
        {
            int feature = j - data.Layout.FirstFeatureColumn;
            int shift = outcomePower - (feature >= 0 ? featurePower + feature : 0);
            Assert.Equal(Math.ScaleB(plain.Coefficients[j].Estimate!.Value, shift), scaled.Coefficients[j].Estimate!.Value);
            Assert.Equal(Math.ScaleB(plain.Coefficients[j].StandardError!.Value, shift), scaled.Coefficients[j].StandardError!.Value);
        }

        Assert.Equal(Math.ScaleB(plain.ResidualStandardDeviation, outcomePower), scaled.ResidualStandardDeviation);
        Assert.Equal(plain.RSquared, scaled.RSquared);
        Assert.Equal(plain.Rank, scaled.Rank);
    }

    /// <summary>Every column times 1e150 or 1e-150: slopes and their SEs keep their certified values, the intercept, its SE and the residual SD scale by the factor.</summary>
    [Theory]
    [InlineData("Norris", 1e150, 10.0)]
    [InlineData("Norris", 1e-150, 10.0)]
    [InlineData("Pontius", 1e150, 10.0)]
    [InlineData("Longley", 1e150, 10.0)]
    [InlineData("Longley", 1e-150, 10.0)]
    [InlineData("Wampler1", 1e-150, 9.0)]
    [InlineData("NoInt2", 1e150, 10.0)]
    public void Certified_values_scale_with_the_data_at_extreme_magnitudes(string name, double factor, double minimumDigits)
    {
        NistDataset data = NistDataset.Load(name);
        FitSummary fit = LeastSquaresFit.Fit(Accumulate(data, _ => factor, factor));

        double[] estimates = data.CertifiedEstimates;
        double[] deviations = data.CertifiedStandardDeviations;
        for (int j = 0; j < estimates.Length; j++)
        {
            double scale = data.Layout.Intercept && j == 0 ? factor : 1.0;
            double lre = Lre.Of(fit.Coefficients[j].Estimate!.Value, estimates[j] * scale);
            output.WriteLine($"{name} ×{factor:G3} estimate {j}: LRE {lre:F1}");
            Assert.True(lre >= minimumDigits, $"{name} ×{factor:G3} estimate {j}: {lre:F1} digits");
            Assert.True(Lre.Of(fit.Coefficients[j].StandardError!.Value, deviations[j] * scale) >= minimumDigits, $"{name} ×{factor:G3} std dev {j}");
        }

        Assert.True(Lre.Of(fit.ResidualStandardDeviation, data.CertifiedResidualSd * factor) >= minimumDigits, $"{name} ×{factor:G3} residual SD");
        Assert.True(Lre.Of(fit.RSquared, data.CertifiedRSquared) >= minimumDigits, $"{name} ×{factor:G3} R²");
    }

    [Fact]
    public void Values_near_1e160_and_1e_200_are_fitted_not_refused_or_zeroed()
    {
        NistDataset data = NistDataset.Load("Norris");
        FitSummary plain = LeastSquaresFit.Fit(data.Accumulate());
        foreach (double factor in (double[])[1e160, 1e-200, 1e300, 1e-300])
        {
            FitSummary fit = LeastSquaresFit.Fit(Accumulate(data, _ => factor, factor));
            Assert.True(fit.IsFullRank, $"×{factor:G3}");
            Assert.True(Lre.Of(fit.Coefficients[1].Estimate!.Value, plain.Coefficients[1].Estimate!.Value) >= 12, $"×{factor:G3} slope");
            Assert.True(Lre.Of(fit.ResidualStandardDeviation, plain.ResidualStandardDeviation * factor) >= 12, $"×{factor:G3} residual SD");
        }
    }

    [Fact]
    public void A_coefficient_beyond_double_precision_is_a_clear_error_naming_its_column()
    {
        var layout = new DesignLayout(["tiny"], "huge", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        for (int i = 0; i < 20; i++)
        {
            accumulator.AddRow([(i + (0.1 * (i % 3))) * 1e-300], (3.0 * i + (i % 2)) * 1e300);
        }

        var ex = Assert.Throws<ColumnScaleException>(() => LeastSquaresFit.Fit(accumulator.ToFactor()));
        Assert.Equal("tiny", ex.Column);
        Assert.StartsWith("column 'tiny': its coefficient or standard error", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Merging_accumulators_on_different_scales_gives_the_factor_of_all_rows()
    {
        NistDataset data = NistDataset.Load("Longley");
        int half = data.Outcome.Length / 2;
        var first = new LeastSquaresAccumulator(data.Layout);
        var second = new LeastSquaresAccumulator(data.Layout);
        var whole = new LeastSquaresAccumulator(data.Layout);
        for (int i = 0; i < data.Outcome.Length; i++)
        {
            (i < half ? first : second).AddRow(data.Design[i], data.Outcome[i]);
            whole.AddRow(data.Design[i], data.Outcome[i]);
        }

        first.Merge(second);
        FitSummary merged = LeastSquaresFit.Fit(first.ToFactor());
        FitSummary direct = LeastSquaresFit.Fit(whole.ToFactor());
        for (int j = 0; j < data.Layout.ParameterCount; j++)
        {
            Assert.True(Lre.Of(merged.Coefficients[j].Estimate!.Value, direct.Coefficients[j].Estimate!.Value) >= 10, $"coefficient {j}");
        }
    }

    private static AugmentedFactor Accumulate(NistDataset data, Func<int, double> featureScale, double outcomeScale)
    {
        var accumulator = new LeastSquaresAccumulator(data.Layout);
        double[] row = new double[data.Layout.Features.Count];
        for (int i = 0; i < data.Outcome.Length; i++)
        {
            for (int j = 0; j < row.Length; j++)
            {
                row[j] = data.Design[i][j] * featureScale(j);
            }

            accumulator.AddRow(row, data.Outcome[i] * outcomeScale);
        }

        return accumulator.ToFactor();
    }
}
