using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class DurbinWatsonBoundsTests
{
    [Theory]
    [InlineData(15, 1, 0.05, 1.077, 1.361)]
    [InlineData(20, 1, 0.05, 1.201, 1.411)]
    [InlineData(30, 1, 0.05, 1.352, 1.489)]
    [InlineData(50, 1, 0.05, 1.503, 1.585)]
    [InlineData(100, 1, 0.05, 1.654, 1.694)]
    [InlineData(20, 2, 0.05, 1.100, 1.537)]
    [InlineData(30, 3, 0.05, 1.214, 1.650)]
    [InlineData(50, 5, 0.05, 1.335, 1.771)]
    [InlineData(100, 5, 0.05, 1.571, 1.780)]
    [InlineData(50, 1, 0.01, 1.324, 1.403)]
    public void Bounds_match_the_tables(int n, int slopes, double alpha, double lower, double upper)
    {
        // Computed with SciPy 1.10.1 from Imhof's (1961, Biometrika 48:419–426) integral over the bounding eigenvalues
        // of Durbin & Watson (1950, Biometrika 37:409–428) (TestData/References/statistics-py.out); they agree with the
        // published tables (Durbin & Watson 1951; Savin & White 1977, Econometrica 45:1989–1996; from memory).
        (double dl, double du) = DurbinWatsonBounds.CriticalValues(n, slopes, alpha);
        Assert.Equal(lower, dl, 3);
        Assert.Equal(upper, du, 3);
    }

    [Fact]
    public void Imhof_reproduces_a_chi_square_tail()
    {
        // Exact: Q = z₁² + z₂² − 3z₃² > 0 ⇔ χ²₂ > 3z₃², and P(χ²₂ > x) = e^{−x/2}, so
        // P(Q > 0) = E[e^{−3z²/2}] = (1 + 3)^{−1/2} = 0.5.
        Assert.Equal(0.5, QuadraticFormDistribution.UpperTailAtZero([1.0, 1.0, -3.0]), 6);
    }

    [Theory]
    [InlineData(1.0, 1.0)]
    [InlineData(4.0, 1.0)]
    [InlineData(0.01, 3.0)]
    [InlineData(250.0, 0.2)]
    public void Imhof_reproduces_the_two_weight_closed_form(double a, double b)
    {
        // Exact: a z₁² − b z₂² > 0 ⇔ |z₂/z₁| < √(a/b), and z₂/z₁ is standard Cauchy, so P = (2/π) atan √(a/b).
        double exact = 2.0 / Math.PI * Math.Atan(Math.Sqrt(a / b));
        Assert.Equal(exact, QuadraticFormDistribution.UpperTailAtZero([a, -b]), 1e-8);
    }

    [Theory]
    [InlineData(3, 2.5)]
    [InlineData(10, 30.0)]
    [InlineData(40, 90.0)]
    public void Imhof_reproduces_an_f_tail(int k, double c)
    {
        // Exact: Σ₁..k zᵢ² − c z₀² > 0 ⇔ F(k, 1) = (χ²ₖ/k)/(z₀²) > c/k; the tail is MathNet's regularized incomplete beta.
        double x = c / k;
        double exact = 1.0 - MathNet.Numerics.Distributions.FisherSnedecor.CDF(k, 1, x);
        double[] weights = [.. Enumerable.Repeat(1.0, k), -c];
        Assert.Equal(exact, QuadraticFormDistribution.UpperTailAtZero(weights), 1e-8);
    }
}
