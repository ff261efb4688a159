namespace ModelWatch.Cli.Reports;

/// <summary>The report's colours, chosen to stay apart for common colour-vision deficiencies.</summary>
internal static class ChartPalette
{
    public const string Refit = "#1d5c8f";
    public const string RefitBand = "#8fb8d8";
    public const string Baseline = "#c0621b";
    public const string Critical = "#b3123f";
    public const string Noise = "#7a8c99";
    public const string Level = "#e0a630";
    public const string Slope = "#2e8b6e";
    public const string BaselineBars = "#e3cfb5";
    public const string Limit = "#6b4c9a";
}
