using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Windows;

/// <summary>Feeds rows straight into a <see cref="LeastSquaresAccumulator"/> (the refit alone, no per-window summaries).</summary>
public sealed class AccumulatorSink : IWindowRowSink
{
    /// <summary>Creates a sink over a fresh accumulator for <paramref name="layout"/>.</summary>
    public AccumulatorSink(DesignLayout layout) => Accumulator = new LeastSquaresAccumulator(layout, NonFiniteValuePolicy.Fail);

    /// <summary>The accumulator the rows went into.</summary>
    public LeastSquaresAccumulator Accumulator { get; }

    /// <inheritdoc />
    public void AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool isNew) => Accumulator.AddRow(features, outcome);

    /// <summary>Folds another sink's rows in (parallel sub-range reads).</summary>
    public static void Merge(AccumulatorSink into, AccumulatorSink other)
    {
        ArgumentNullException.ThrowIfNull(into);
        ArgumentNullException.ThrowIfNull(other);
        into.Accumulator.Merge(other.Accumulator);
    }
}
