using ModelWatch.Checks.Coefficients;
using ModelWatch.Checks.Collinearity;
using ModelWatch.Checks.Data;
using ModelWatch.Checks.PredictionError;
using ModelWatch.Checks.Features;
using ModelWatch.Checks.Residuals;
using ModelWatch.Checks.Serving;
using ModelWatch.Checks.Source;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// The registered checks, in the order a run evaluates them. A new check lives in its own folder and is added here
/// with one line; the run, spec validation, the false-alarm budget and the runbook pick it up from this list.
/// </summary>
public static class CheckRegistry
{
    /// <summary>
    /// Every check. The source check comes first: it judges every run, whatever the row count. The data check comes
    /// next because the others need its verdict on the row count.
    /// </summary>
    public static IReadOnlyList<IModelCheck> All { get; } =
    [
        SourceCheck.Instance,
        DataCheck.Instance,
        ServingCheck.Instance,
        CoefficientsCheck.Instance,
        CollinearityCheck.Instance,
        ResidualsCheck.Instance,
        ErrorCheck.Instance,
        FeaturesCheck.Instance,
    ];

    /// <summary>The check names in run order.</summary>
    public static IReadOnlyList<string> Names { get; } = [.. All.Select(c => c.Name)];

    /// <summary>Every budget channel of every check.</summary>
    public static IReadOnlyList<AlarmChannel> Channels { get; } = [.. All.SelectMany(c => c.Channels)];

    /// <summary>The check with this name, or null.</summary>
    public static IModelCheck? Find(string name) => All.FirstOrDefault(c => c.Name == name);
}
