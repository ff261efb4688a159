namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// Log relative error, the number of correct significant digits as NIST StRD results are judged:
/// −log10(|c − t| / |t|), or −log10(|c − t|) when the certified value t is 0; capped at 15.
/// </summary>
internal static class Lre
{
    public static double Of(double computed, double certified)
    {
        double error = Math.Abs(computed - certified);
        if (error == 0.0)
        {
            return 15.0;
        }

        double lre = certified == 0.0 ? -Math.Log10(error) : -Math.Log10(error / Math.Abs(certified));
        return Math.Min(15.0, lre);
    }
}
