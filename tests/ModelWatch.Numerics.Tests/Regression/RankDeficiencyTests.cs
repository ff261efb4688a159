using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Regression;

public sealed class RankDeficiencyTests
{
    [Fact]
    public void Exact_dependency_drops_the_later_column_and_names_the_others()
    {
        // total_km = route_km + detour_km exactly (integers, so the dependency is exact in floating point).
        var layout = new DesignLayout(["route_km", "detour_km", "total_km", "stops"], "minutes", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        var random = new Random(31);
        for (int i = 0; i < 200; i++)
        {
            double route = random.Next(1, 60);
            double detour = random.Next(0, 9);
            double stops = random.Next(1, 25);
            accumulator.AddRow([route, detour, route + detour, stops], 5 + (2 * route) + (3 * detour) + stops + RandomDesign.Gaussian(random));
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());

        Assert.Equal(4, fit.Rank);
        Assert.False(fit.IsFullRank);
        Assert.Equal(["total_km"], fit.RankDeficiency!.AliasedTerms);
        string reason = Assert.Single(fit.RankDeficiency.Reasons);
        Assert.Contains("total_km", reason, StringComparison.Ordinal);
        Assert.Contains("route_km", reason, StringComparison.Ordinal);
        Assert.Contains("detour_km", reason, StringComparison.Ordinal);
        Assert.DoesNotContain("stops", reason, StringComparison.Ordinal);
        Assert.Null(fit.Coefficients[3].Estimate);
        Assert.All(fit.Coefficients.Where(c => !c.IsAliased), c => Assert.True(double.IsFinite(c.Estimate!.Value)));
        Assert.Equal(2.0, fit.Coefficients[1].Estimate!.Value, 0.3);
        Assert.Equal(3.0, fit.Coefficients[2].Estimate!.Value, 0.3);
        Assert.True(double.IsPositiveInfinity(fit.VarianceInflationFactors["total_km"]));
        Assert.Equal(196, fit.ResidualDegreesOfFreedom);
    }

    [Fact]
    public void Constant_column_beside_the_intercept_is_named_as_constant()
    {
        var layout = new DesignLayout(["parcel_kg", "depot"], "minutes", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        for (int i = 0; i < 30; i++)
        {
            accumulator.AddRow([i * 0.5, 7.0], 10 + i);
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());

        Assert.Equal(2, fit.Rank);
        Assert.Equal(["depot"], fit.RankDeficiency!.AliasedTerms);
        Assert.Contains("'depot' is constant (7)", fit.RankDeficiency.Message, StringComparison.Ordinal);
        Assert.Contains("intercept", fit.RankDeficiency.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Fewer_rows_than_parameters_says_so()
    {
        var layout = new DesignLayout(["a", "b", "c", "d"], "y", intercept: true);
        var accumulator = new LeastSquaresAccumulator(layout);
        accumulator.AddRow([1, 4, 2, 8], 1);
        accumulator.AddRow([2, 1, 7, 1], 2);
        accumulator.AddRow([3, 5, 1, 9], 4);

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());

        Assert.Equal(3, fit.Rank);
        Assert.Contains("only 3 rows for 5 parameters", fit.RankDeficiency!.Message, StringComparison.Ordinal);
        Assert.Equal(2, fit.RankDeficiency.AliasedTerms.Count);
        Assert.Equal(0, fit.ResidualDegreesOfFreedom);
        Assert.True(double.IsNaN(fit.ResidualStandardDeviation));
        Assert.All(fit.Coefficients.Where(c => !c.IsAliased), c => Assert.True(double.IsFinite(c.Estimate!.Value)));
    }

    [Fact]
    public void All_zero_column_is_named()
    {
        var layout = new DesignLayout(["x", "unused"], "y", intercept: false);
        var accumulator = new LeastSquaresAccumulator(layout);
        for (int i = 1; i <= 10; i++)
        {
            accumulator.AddRow([i, 0.0], 2.0 * i);
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());

        Assert.Equal(["unused"], fit.RankDeficiency!.AliasedTerms);
        Assert.Contains("'unused' is zero in every row", fit.RankDeficiency.Message, StringComparison.Ordinal);
        Assert.Equal(2.0, fit.Coefficients[0].Estimate!.Value, 12);
    }

    [Fact]
    public void Empty_accumulator_gives_a_named_result_not_an_exception()
    {
        var fit = LeastSquaresFit.Fit(new LeastSquaresAccumulator(new DesignLayout(["x"], "y", intercept: true)).ToFactor());

        Assert.Equal(0, fit.Rank);
        Assert.Contains("only 0 rows for 2 parameters", fit.RankDeficiency!.Message, StringComparison.Ordinal);
        Assert.All(fit.Coefficients, c => Assert.Null(c.Estimate));
    }
}
