using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Windows;

/// <summary>Feeds a run's window into a <see cref="WindowSummaryBuilder"/>: refit, deployed residuals, bins, leverage and reservoir in one pass.</summary>
public sealed class WindowSummarySink : IWindowRowSink
{
    /// <summary>Creates a sink over a fresh builder against <paramref name="baseline"/>.</summary>
    public WindowSummarySink(DesignLayout layout, BaselineReference baseline, WindowSummaryOptions options) =>
        Builder = new WindowSummaryBuilder(layout, baseline, options);

    /// <summary>The builder the rows went into.</summary>
    public WindowSummaryBuilder Builder { get; }

    /// <inheritdoc />
    public void AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool isNew) => Builder.AddRow(features, outcome, servedPrediction, isNew);

    /// <summary>Folds a later sub-range's sink into an earlier one.</summary>
    public static void Merge(WindowSummarySink into, WindowSummarySink other)
    {
        ArgumentNullException.ThrowIfNull(into);
        ArgumentNullException.ThrowIfNull(other);
        into.Builder.Merge(other.Builder);
    }
}
