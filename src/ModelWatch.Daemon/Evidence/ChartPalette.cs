namespace ModelWatch.Daemon.Evidence;

/// <summary>
/// The report's colours, in one place so that a legend's swatch is always the colour of its mark. Chosen to stay
/// apart for the common colour-vision deficiencies; severities also differ in shape or label, never in colour alone.
/// </summary>
internal static class ChartPalette
{
    public const string Refit = "#1d5c8f";
    public const string RefitBand = "#8fb8d8";
    public const string Baseline = "#c0621b";
    public const string Critical = "#b3123f";
    public const string Warning = "#d49a1c";
    public const string Ok = "#1d5c8f";
    public const string Noise = "#7a8c99";
    public const string Level = "#e0a630";
    public const string Slope = "#2e8b6e";
    public const string BaselineBars = "#e3cfb5";
    public const string Limit = "#6b4c9a";
    public const string OpenPeriod = "#f2c9d4";
    public const string EvidenceRun = "#b3123f";

    /// <summary>Colours for one line per feature, in order.</summary>
    public static readonly IReadOnlyList<string> Series = ["#1d5c8f", "#c0621b", "#2e8b6e", "#6b4c9a", "#8a6100", "#b3123f", "#4d7f99", "#7a5c3e"];

    /// <summary>The colour of a severity (bars, marks and their legend).</summary>
    public static string Of(string severity) => severity switch
    {
        "critical" => Critical,
        "warning" => Warning,
        _ => Ok,
    };
}
