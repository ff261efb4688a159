namespace ModelWatch.Checks.Tests.Support;

/// <summary>An injected change for <see cref="SyntheticModel"/>.</summary>
internal sealed record Shift
{
    public static readonly Shift None = new();

    public int? CoefficientFeature { get; init; }

    public double CoefficientChange { get; init; }

    public double Bias { get; init; }

    public double VarianceFactor { get; init; } = 1.0;

    public int? CorrelateFeature { get; init; }

    public int CorrelateWith { get; init; }

    public int? MeanShiftFeature { get; init; }

    public double MeanShift { get; init; }
}
