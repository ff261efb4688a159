namespace ModelWatch.Calibration;

/// <summary>An injected change for <see cref="SyntheticModel"/>.</summary>
public sealed record Shift
{
    /// <summary>No change.</summary>
    public static readonly Shift None = new();

    /// <summary>Feature (0-based) whose coefficient changes.</summary>
    public int? CoefficientFeature { get; init; }

    /// <summary>Change of that coefficient.</summary>
    public double CoefficientChange { get; init; }

    /// <summary>Outcome bias, in σ.</summary>
    public double Bias { get; init; }

    /// <summary>Factor on the error variance.</summary>
    public double VarianceFactor { get; init; } = 1.0;

    /// <summary>Feature (0-based) made to follow <see cref="CorrelateWith"/>.</summary>
    public int? CorrelateFeature { get; init; }

    /// <summary>The feature it follows.</summary>
    public int CorrelateWith { get; init; }

    /// <summary>Correlation of the pair once correlated.</summary>
    public double Correlation { get; init; } = 0.98;

    /// <summary>Feature (0-based) whose mean shifts.</summary>
    public int? MeanShiftFeature { get; init; }

    /// <summary>Shift of that mean, in SDs.</summary>
    public double MeanShift { get; init; }
}
