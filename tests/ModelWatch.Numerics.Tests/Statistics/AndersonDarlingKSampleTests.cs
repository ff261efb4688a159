using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class AndersonDarlingKSampleTests
{
    private static readonly IReadOnlyList<double>[] Labs = [ReferenceData.LabA, ReferenceData.LabB, ReferenceData.LabC, ReferenceData.LabD];

    [Fact]
    public void Four_labs_match_Scholz_and_Stephens_version_1()
    {
        // Scholz & Stephens 1987 (JASA 82:918–924) report A² = 8.3559 for this example; σ_N = 1.2038 from the paper's
        // closed form. Both recomputed with R 4.2.2 kSamples 1.2-9 (TestData/References/statistics-r.out); T = 4.449262
        // with SciPy 1.10.1 anderson_ksamp(midrank=False) (statistics-py.out).
        AndersonDarlingResult result = AndersonDarlingKSample.Compute(Labs, midrank: false);
        Assert.Equal(8.3559, result.Statistic, 4);
        Assert.Equal(1.2038, result.StandardDeviation, 4);
        Assert.Equal(4.449262, result.Standardized, 5);

        // p = 0.002312 with SciPy 1.10.1, whose interpolation in the paper's table PValue follows (statistics-py.out);
        // the paper gives p ≈ 0.0023.
        Assert.Equal(0.002312, AndersonDarlingKSample.PValue(result.Standardized, 4), 6);
    }

    [Fact]
    public void Four_labs_match_the_midrank_version_2()
    {
        // Scholz & Stephens 1987, midrank version: A² = 8.3926 (kSamples 1.2-9, statistics-r.out); T = 4.479781 with
        // SciPy 1.10.1 anderson_ksamp (statistics-py.out).
        AndersonDarlingResult result = AndersonDarlingKSample.Compute(Labs, midrank: true);
        Assert.Equal(8.3926, result.Statistic, 4);
        Assert.Equal(4.479781, result.Standardized, 5);

        // p = 0.002225 with SciPy 1.10.1 (statistics-py.out); the paper gives p ≈ 0.0022.
        Assert.Equal(0.002225, AndersonDarlingKSample.PValue(result.Standardized, 4), 6);
    }

    [Theory]
    [InlineData(2)]
    [InlineData(4)]
    public void Beyond_the_table_the_p_value_is_its_smallest_level_and_never_rises_again(int samples)
    {
        // The quadratic fitted to Scholz & Stephens' table turns upward near T = 28 (k = 2): extrapolated, T = 199 gave p = 1.
        double[] t = [3.0, 5.0, 6.0, 7.0, 10.0, 28.0, 50.0, 199.0, 1e6];
        double[] p = [.. t.Select(x => AndersonDarlingKSample.PValue(x, samples))];
        for (int i = 1; i < p.Length; i++)
        {
            Assert.True(p[i] <= p[i - 1], "p rose between T = " + t[i - 1] + " and " + t[i]);
        }

        Assert.Equal(AndersonDarlingKSample.SmallestTabulatedPValue, AndersonDarlingKSample.PValue(199.0, samples));
        Assert.True(AndersonDarlingKSample.BeyondTable(199.0, samples));
        Assert.False(AndersonDarlingKSample.BeyondTable(3.0, samples));
    }
}
