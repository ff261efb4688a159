using ModelWatch.Numerics.Regression;
using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class SpreadAndSerialCorrelationTests
{
    [Fact]
    public void Brown_Forsythe_on_labs_A_and_D_matches_R()
    {
        // Brown & Forsythe (1974) on Scholz–Stephens labs A and D: F(1,14) = 0.41883, p = 0.52799 with R 4.2.2
        // car 3.1-1 leveneTest(center = median) (TestData/References/statistics-r.out).
        StatisticalTest result = BrownForsythe.TwoSample(ReferenceData.LabA, ReferenceData.LabD);
        Assert.Equal(0.41883, result.Statistic, 5);
        Assert.Equal(0.52799, result.PValue, 5);
        Assert.Equal(14.0, result.DegreesOfFreedom2);
    }

    [Fact]
    public void Ljung_Box_and_Box_Pierce_on_the_lh_series_match_R()
    {
        // R 4.2.2 Box.test (statistics-r.out): Q(1) = 16.913792; Q(10) = 25.350930 (p = 0.004719);
        // Box–Pierce(10) = 23.094810.
        Assert.Equal(16.913792, Autocorrelation.LjungBox(ReferenceData.Lh, 1).Statistic, 6);
        StatisticalTest q10 = Autocorrelation.LjungBox(ReferenceData.Lh, 10);
        Assert.Equal(25.350930, q10.Statistic, 6);
        Assert.Equal(0.004719, q10.PValue, 6);
        Assert.Equal(23.094810, Autocorrelation.BoxPierce(ReferenceData.Lh, 10).Statistic, 6);
    }

    [Fact]
    public void Durbin_Watson_of_the_pooled_savings_regression_matches_lmtest()
    {
        // lmtest 0.9-40 dwtest (statistics-r.out): pooled Gujarati savings regression d = 0.859717.
        double[] residuals = OlsResiduals(ReferenceData.SavingsX, ReferenceData.SavingsY);
        Assert.Equal(0.859717, Autocorrelation.DurbinWatson(residuals), 6);

        // Same residuals, R Box.test(type = "Ljung-Box") (statistics-r.out): LB(5) = 10.19276, p = 0.06995.
        StatisticalTest lb = Autocorrelation.LjungBox(residuals, 5);
        Assert.Equal(10.19276, lb.Statistic, 5);
        Assert.Equal(0.06995, lb.PValue, 5);
    }

    [Fact]
    public void Koenker_and_Breusch_Pagan_on_Gujarati_table_11_3_match_the_textbook_and_lmtest()
    {
        // lmtest 0.9-40 bptest (statistics-r.out): BP = 5.214011 (studentize = FALSE; Gujarati's Θ = 5.2140, from
        // memory), Koenker LM = 5.272187 (p = 0.02167).
        double[] residuals = OlsResiduals(ReferenceData.ConsumptionX, ReferenceData.ConsumptionY);
        double[][] z = ReferenceData.ConsumptionX.Select(x => new[] { x }).ToArray();
        StatisticalTest bp = Heteroscedasticity.BreuschPagan(z, residuals);
        StatisticalTest koenker = Heteroscedasticity.Koenker(z, residuals);
        Assert.Equal(5.214011, bp.Statistic, 6);
        Assert.Equal(5.272187, koenker.Statistic, 6);
        Assert.Equal(0.02167, koenker.PValue, 5);
    }

    [Fact]
    public void Holm_adjustment_matches_the_step_down_rule()
    {
        // Worked by hand from Holm (1979): sorted 0.01, 0.02, 0.03, 0.5 → 4·0.01, 3·0.02, max(2·0.03, 0.06), max(0.5, 0.06).
        double[] adjusted = MultipleTesting.HolmAdjusted([0.03, 0.5, 0.01, 0.02]);
        Assert.Equal([0.06, 0.5, 0.04, 0.06], adjusted.Select(v => Math.Round(v, 12)).ToArray());
        Assert.True(double.IsNaN(MultipleTesting.HolmAdjusted([double.NaN, 0.2])[0]));
        Assert.Equal(0.2, MultipleTesting.HolmAdjusted([double.NaN, 0.2])[1], 14);
    }

    [Fact]
    public void Quantiles_match_standard_tables()
    {
        // Normal 97.5 % point 1.959964 and χ²₉ 99 % point 21.666 (standard tables; R qnorm / qchisq in
        // TestData/References/statistics-r.out). PSI's null 99 % point for 10 bins, N = 10,000 reference and M = 500
        // new rows: (1/N + 1/M)·χ²₉,0.99 = 0.0455 (same file).
        Assert.Equal(1.959964, StandardDistributions.NormalQuantile(0.975), 6);
        Assert.Equal(1.959964, StandardDistributions.NormalUpperQuantile(0.025), 6);
        Assert.Equal(21.666, StandardDistributions.ChiSquareUpperQuantile(0.01, 9), 3);
        Assert.Equal(0.0455, (1.0 / 10000 + 1.0 / 500) * StandardDistributions.ChiSquareUpperQuantile(0.01, 9), 4);
        Assert.Equal(1e-6, StandardDistributions.ChiSquareUpperTail(StandardDistributions.ChiSquareUpperQuantile(1e-6, 6), 6), 12);

        // F and t points from Abramowitz & Stegun (1964), Tables 26.9 and 26.10: F(5, 10) 95 % point 3.33, F(1, 10) 99 %
        // point 10.04, two-sided t₁₀ 5 % point 2.228; a budgeted level of 1e-7 inverts to its own digits.
        Assert.Equal(3.33, StandardDistributions.FisherUpperQuantile(0.05, 5, 10), 2);
        Assert.Equal(10.04, StandardDistributions.FisherUpperQuantile(0.01, 1, 10), 2);
        Assert.Equal(2.228, StandardDistributions.StudentTTwoSidedQuantile(0.05, 10), 3);
        double f = StandardDistributions.FisherUpperQuantile(1e-7, 4, 50);
        Assert.Equal(1.0, StandardDistributions.FisherUpper(f, 4, 50) / 1e-7, 9);
        Assert.True(double.IsNaN(StandardDistributions.FisherUpperQuantile(0.0, 4, 50)));

        // A Chow predictive test on a million new rows against a million reference rows: F stays near 1.
        double large = StandardDistributions.FisherUpperQuantile(6e-6, 1e6, 1e6);
        Assert.InRange(large, 1.005, 1.02);
        Assert.Equal(1.0, StandardDistributions.FisherUpper(large, 1e6, 1e6) / 6e-6, 6);
    }

    [Fact]
    public void Beta_binomial_with_a_uniform_prior_is_the_discrete_uniform()
    {
        // Exact rational check: BetaBinomial(m, 1, 1) puts 1/(m+1) on each count.
        Assert.Equal(1.0 / 11.0, BetaBinomial.Probability(10, 1.0, 1.0, 4), 12);
        Assert.Equal((4.0 / 11.0) + (0.5 / 11.0), BetaBinomial.UpperTailMidP(10, 1.0, 1.0, 6), 12);
    }

    private static double[] OlsResiduals(double[] x, double[] y)
    {
        var layout = new DesignLayout(["x"], "y", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        for (int i = 0; i < x.Length; i++)
        {
            accumulator.AddRow([x[i]], y[i]);
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
        double b0 = fit.Coefficients[0].Estimate!.Value;
        double b1 = fit.Coefficients[1].Estimate!.Value;
        return x.Select((v, i) => y[i] - b0 - (b1 * v)).ToArray();
    }
}
