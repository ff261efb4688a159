using ModelWatch.Numerics.Regression;
using Xunit.Abstractions;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// Ill-conditioned random problems against their exact rational least-squares solution. A backward-stable QR
/// loses about log10(κ) digits when residuals are small (Wedin's bound, Golub and Van Loan §5.3, from memory),
/// so with κ the scaled condition number the estimates must keep at least 15 − log10(κ) − 1 digits.
/// </summary>
public sealed class ExactArithmeticTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(21, 1e-3)]
    [InlineData(22, 1e-5)]
    [InlineData(23, 1e-7)]
    public void Ill_conditioned_fit_keeps_the_digits_its_condition_number_allows(int seed, double separation)
    {
        // Features 2 and 3 are near-copies of feature 1 (offsets of relative size `separation`).
        var random = new Random(seed);
        const int rows = 60;
        var design = new double[rows][];
        var withIntercept = new double[rows][];
        var outcome = new double[rows];
        for (int i = 0; i < rows; i++)
        {
            double a = random.NextDouble() * 10.0;
            double b = (random.NextDouble() * 4.0) + 1.0;
            double[] x = [a, a + (separation * RandomDesign.Gaussian(random)), b, a - (2 * separation * RandomDesign.Gaussian(random))];
            design[i] = x;
            withIntercept[i] = [1.0, .. x];
            outcome[i] = 1.0 + (2.0 * x[0]) - x[1] + (0.5 * x[2]) + (3.0 * x[3]) + (1e-3 * RandomDesign.Gaussian(random));
        }

        var layout = new DesignLayout(["a", "a_copy", "b", "a_echo"], "y", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.Fail, blockRows: 16);
        for (int i = 0; i < rows; i++)
        {
            accumulator.AddRow(design[i], outcome[i]);
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
        double[] exact = ExactLeastSquares.Solve(withIntercept, outcome);

        double allowed = 15.0 - Math.Log10(fit.ConditionNumber) - 1.0;
        double worst = Enumerable.Range(0, exact.Length).Min(j => Lre.Of(fit.Coefficients[j].Estimate!.Value, exact[j]));
        output.WriteLine($"separation {separation:G2}: scaled condition number {fit.ConditionNumber:G3}, worst LRE {worst:F2}, required {allowed:F2}");
        Assert.True(fit.IsFullRank);
        Assert.True(worst >= allowed, $"worst LRE {worst:F2} < {allowed:F2}");
    }
}
