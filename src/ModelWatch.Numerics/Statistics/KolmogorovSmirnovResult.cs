namespace ModelWatch.Numerics.Statistics;

/// <summary>A two-sample Kolmogorov–Smirnov result.</summary>
/// <param name="Statistic">D, the largest distance between the two empirical distribution functions.</param>
/// <param name="PValue">The p-value under the pinned rule (exact or the Kolmogorov limit).</param>
/// <param name="Exact">True when the exact distribution was used.</param>
/// <param name="FirstCount">Size of the first sample.</param>
/// <param name="SecondCount">Size of the second sample.</param>
public sealed record KolmogorovSmirnovResult(double Statistic, double PValue, bool Exact, int FirstCount, int SecondCount);
