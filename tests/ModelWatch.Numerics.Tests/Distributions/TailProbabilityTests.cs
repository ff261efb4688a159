using ModelWatch.Numerics.Distributions;

namespace ModelWatch.Numerics.Tests.Distributions;

public sealed class TailProbabilityTests
{
    /// <summary>With one degree of freedom t is Cauchy: P(|T| ≥ t) = 1 − (2/π)·atan(t) = (2/π)·atan(1/t), exactly.</summary>
    [Theory]
    [InlineData(0.5)]
    [InlineData(1.0)]
    [InlineData(12.706)]
    [InlineData(1e6)]
    public void Student_t_with_one_degree_of_freedom_matches_the_cauchy_closed_form(double t)
    {
        double expected = 2.0 / Math.PI * Math.Atan(1.0 / t);
        Assert.Equal(expected, TailProbability.StudentTTwoSided(t, 1), expected * 1e-12);
    }

    /// <summary>F(2, d) upper tail is (1 + 2f/d)^(−d/2) in closed form; tiny tails keep their digits.</summary>
    [Theory]
    [InlineData(3.0, 10.0)]
    [InlineData(50.0, 7.0)]
    [InlineData(1e4, 30.0)]
    public void F_with_two_numerator_degrees_of_freedom_matches_its_closed_form(double f, double d)
    {
        double expected = Math.Pow(1.0 + (2.0 * f / d), -d / 2.0);
        Assert.Equal(expected, TailProbability.FisherUpper(f, 2, d), expected * 1e-10);
    }

    /// <summary>Student t table: t(0.975, 10) = 2.228 (two-sided 5 %), a textbook table value typed from memory.</summary>
    [Fact]
    public void Student_t_table_value()
    {
        Assert.Equal(0.05, TailProbability.StudentTTwoSided(2.228138851986, 10), 1e-9);
    }
}
