using System.Globalization;

namespace ModelWatch.Calibration;

/// <summary>How a model is watched: the window each run reads and how often it runs; their ratio is the overlap.</summary>
/// <param name="Window">Length of the window a run reads.</param>
/// <param name="Every">Time between runs.</param>
public sealed record Cadence(TimeSpan Window, TimeSpan Every)
{
    /// <summary>An hourly window checked hourly (no overlap).</summary>
    public static readonly Cadence Ratio1 = new(TimeSpan.FromHours(1), TimeSpan.FromHours(1));

    /// <summary>A 7-day window checked daily.</summary>
    public static readonly Cadence Ratio7 = new(TimeSpan.FromDays(7), TimeSpan.FromDays(1));

    /// <summary>A 24-hour window checked hourly.</summary>
    public static readonly Cadence Ratio24 = new(TimeSpan.FromHours(24), TimeSpan.FromHours(1));

    /// <summary>The three ratios the calibration reports.</summary>
    public static IReadOnlyList<Cadence> All { get; } = [Ratio1, Ratio7, Ratio24];

    /// <summary>Window over cadence.</summary>
    public int Ratio => (int)Math.Round(Window / Every);

    /// <summary>Hours between runs.</summary>
    public int HoursPerRun => (int)Math.Round(Every.TotalHours);

    /// <summary>Hours in a window.</summary>
    public int HoursPerWindow => (int)Math.Round(Window.TotalHours);

    /// <summary>A label such as "7 (7 d window, every 1 d)".</summary>
    public string Label => string.Create(CultureInfo.InvariantCulture, $"{Ratio} ({Describe(Window)} window, every {Describe(Every)})");

    private static string Describe(TimeSpan span) => span.TotalHours >= 24 && span.TotalHours % 24 == 0
        ? string.Create(CultureInfo.InvariantCulture, $"{span.TotalDays:0} d")
        : string.Create(CultureInfo.InvariantCulture, $"{span.TotalHours:0} h");
}
