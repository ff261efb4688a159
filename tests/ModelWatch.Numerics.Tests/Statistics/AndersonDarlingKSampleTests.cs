using ModelWatch.Numerics.Statistics;
using Xunit;

namespace ModelWatch.Numerics.Tests.Statistics;

public sealed class AndersonDarlingKSampleTests
{
    private static readonly IReadOnlyList<double>[] Labs = [ReferenceData.LabA, ReferenceData.LabB, ReferenceData.LabC, ReferenceData.LabD];

    [Fact]
    public void Four_labs_match_Scholz_and_Stephens_version_1()
    {
        // methods.md §5.4 / §8.4 [L: cmstatr tests reproducing the paper; C: kSamples, SciPy 1.10.1
        // anderson_ksamp(midrank=False) T = 4.449262]: A² = 8.3559, σ_N = 1.2038.
        AndersonDarlingResult result = AndersonDarlingKSample.Compute(Labs, midrank: false);
        Assert.Equal(8.3559, result.Statistic, 4);
        Assert.Equal(1.2038, result.StandardDeviation, 4);
        Assert.Equal(4.449262, result.Standardized, 5);

        // p = 0.002312 [C: SciPy 1.10.1]; the paper's p ≈ 0.0023 [L].
        Assert.Equal(0.002312, AndersonDarlingKSample.PValue(result.Standardized, 4), 6);
    }

    [Fact]
    public void Four_labs_match_the_midrank_version_2()
    {
        // methods.md §5.4 [L; C: SciPy 1.10.1 anderson_ksamp T = 4.479781]: A² = 8.3926.
        AndersonDarlingResult result = AndersonDarlingKSample.Compute(Labs, midrank: true);
        Assert.Equal(8.3926, result.Statistic, 4);
        Assert.Equal(4.479781, result.Standardized, 5);

        // p = 0.002225 [C: SciPy 1.10.1]; the paper's p ≈ 0.0022 [L].
        Assert.Equal(0.002225, AndersonDarlingKSample.PValue(result.Standardized, 4), 6);
    }
}
