using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class PageCusumTests
{
    [Theory]
    [InlineData(4.0, 0.0, 335.37)]
    [InlineData(5.0, 0.0, 930.89)]
    [InlineData(4.0, 0.5, 26.68)]
    [InlineData(4.0, 1.0, 8.38)]
    [InlineData(4.0, 2.0, 3.34)]
    [InlineData(5.0, 1.0, 10.38)]
    public void One_sided_ARL_matches_spc(double h, double shift, double expected)
    {
        // R 4.2.2 spc 0.6.7 xcusum.arl, k = 0.5, zero start, Gaussian (TestData/References/statistics-r.out). The ARLs
        // at a 1σ shift, 8.38 and 10.4, are those of Montgomery's Introduction to Statistical Quality Control tables
        // (from memory).
        Assert.Equal(expected, PageCusum.OneSidedArlMarkov(h, 0.5, shift), expected * 0.002);
    }

    [Theory]
    [InlineData(4.0, 167.68)]
    [InlineData(5.0, 465.44)]
    [InlineData(7.921, 8760.0)]
    [InlineData(4.774, 370.0)]
    [InlineData(5.757, 1000.0)]
    [InlineData(9.529, 43800.0)]
    public void Two_sided_in_control_ARL_matches_the_threshold_table(double h, double expected)
    {
        // spc 0.6.7 xcusum.crit / xcusum.arl, two-sided, k = 0.5 (statistics-r.out, which also has the ARL at each
        // quoted h); h is quoted to 3-4 digits, so the ARL agrees to about 0.5 %. Montgomery's tables give 168 and 465
        // for h = 4 and 5 (from memory).
        Assert.Equal(expected, PageCusum.TwoSidedArlMarkov(h, 0.5, 0.0), expected * 0.005);
    }

    [Theory]
    [InlineData(7.921, 1.0, 16.2)]
    [InlineData(7.921, 0.5, 82.6)]
    [InlineData(4.774, 1.0, 9.92)]
    public void Two_sided_out_of_control_ARL_matches_the_table(double h, double shift, double expected)
    {
        // spc 0.6.7 xcusum.arl, two-sided, at the quoted h (statistics-r.out).
        Assert.Equal(expected, PageCusum.TwoSidedArlMarkov(h, 0.5, shift), expected * 0.01);
    }

    [Fact]
    public void Threshold_for_a_one_year_ARL_at_hourly_runs_is_7_921()
    {
        // spc 0.6.7 xcusum.crit(k = 0.5, L0 = 8760, sided = "two") = 7.92079 (statistics-r.out).
        Assert.Equal(7.921, PageCusum.ThresholdForArl(8760.0), 2);
    }

    [Theory]
    [InlineData(4.0, 338.1)]
    [InlineData(5.0, 938.2)]
    public void Siegmund_approximation_matches_the_quoted_values(double h, double expected)
    {
        // Siegmund's (1985, Sequential Analysis, Springer) approximation with b = h + 1.166, evaluated in
        // statistics-r.out: 338.1 (h = 4) and 938.2 (h = 5), one-sided.
        Assert.Equal(expected, PageCusum.OneSidedArlSiegmund(h, 0.5, 0.0), 1);
    }

    [Fact]
    public void Step_resets_nothing_and_signals_above_h()
    {
        double up = 0.0;
        double down = 0.0;
        Assert.False(PageCusum.Step(ref up, ref down, 2.0, 0.5, 4.0));
        Assert.Equal(1.5, up, 14);
        Assert.True(PageCusum.Step(ref up, ref down, 3.5, 0.5, 4.0));
        Assert.Equal(4.5, up, 14);
        Assert.Equal(0.0, down);
    }
}
