using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Store.Windows;

/// <summary>Feeds a reference window into a <see cref="BaselineBuilder"/> (one sequential read: the builder does not merge).</summary>
public sealed class BaselineSink : IWindowRowSink
{
    /// <summary>Creates a sink over a fresh builder.</summary>
    public BaselineSink(DesignLayout layout, BaselineBuilderOptions options) => Builder = new BaselineBuilder(layout, options);

    /// <summary>The builder the rows went into.</summary>
    public BaselineBuilder Builder { get; }

    /// <inheritdoc />
    public void AddRow(ReadOnlySpan<double> features, double outcome, double? servedPrediction, bool isNew) => Builder.AddRow(features, outcome);
}
