using ModelWatch.Numerics.Statistics;

namespace ModelWatch.Checks.Sequential;

/// <summary>
/// The persisted sums of one Page (1954) CUSUM: <c>S⁺ = max(0, S⁺ + z − k)</c>, <c>S⁻ = max(0, S⁻ − z − k)</c>, reset after
/// an alarm, with the alarms counted since the baseline.
/// </summary>
public sealed record CusumSums
{
    /// <summary>Upper sum S⁺.</summary>
    public double Upper { get; init; }

    /// <summary>Lower sum S⁻ (zero for a one-sided CUSUM).</summary>
    public double Lower { get; init; }

    /// <summary>Alarms since the baseline.</summary>
    public int Alarms { get; init; }

    /// <summary>The larger sum.</summary>
    public double Peak => Math.Max(Upper, Lower);

    /// <summary>Steps both sums by z; on an alarm the returned sums are reset, and <c>Crossed</c> holds the sums that crossed.</summary>
    public (CusumSums Next, bool Alarm, CusumSums Crossed) Step(double z, double reference, double threshold)
    {
        double upper = Upper;
        double lower = Lower;
        bool alarm = PageCusum.Step(ref upper, ref lower, z, reference, threshold);
        var crossed = this with { Upper = upper, Lower = lower };
        return alarm ? (new CusumSums { Alarms = Alarms + 1 }, true, crossed) : (crossed, false, crossed);
    }

    /// <summary>Steps the upper sum alone (shifts that only go one way).</summary>
    public (CusumSums Next, bool Alarm, CusumSums Crossed) StepUpper(double z, double reference, double threshold)
    {
        double upper = Upper;
        bool alarm = PageCusum.StepUpper(ref upper, z, reference, threshold);
        var crossed = this with { Upper = upper, Lower = 0.0 };
        return alarm ? (new CusumSums { Alarms = Alarms + 1 }, true, crossed) : (crossed, false, crossed);
    }
}
