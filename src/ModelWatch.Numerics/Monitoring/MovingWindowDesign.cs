namespace ModelWatch.Numerics.Monitoring;

/// <summary>
/// When a moving-window monitor is looked at, in units of the history's length n. The window holds
/// <see cref="Window"/> (h) history lengths of rows; it is evaluated every <see cref="Step"/> = h/r, that is
/// <see cref="StepsPerWindow"/> (r) times per window length, <see cref="Evaluations"/> times in all, at monitoring
/// times <c>x_k = 1 + k·Step</c>. With <see cref="OverlapsHistory"/> the first windows reach back into the history
/// (monitoring starts right after it, as in strucchange); without, every window lies after it, which a monitor that
/// starts later, or restarts, sees, and which crosses at least as often (so its critical values are conservative for
/// the overlapping start).
/// </summary>
/// <param name="Window">h: the moving window as a fraction of the history.</param>
/// <param name="StepsPerWindow">r ≥ 1: evaluations per window length (1 when windows do not overlap).</param>
/// <param name="Evaluations">N ≥ 1: evaluations over the horizon.</param>
/// <param name="OverlapsHistory">Whether the first windows overlap the history (needs h ≤ 1).</param>
public sealed record MovingWindowDesign(double Window, int StepsPerWindow, int Evaluations, bool OverlapsHistory)
{
    /// <summary>Spacing of evaluations, h/r.</summary>
    public double Step => Window / StepsPerWindow;

    /// <summary>Monitoring time of the last evaluation, <c>1 + N·h/r</c> (strucchange's <c>period</c>).</summary>
    public double Horizon => 1.0 + (Evaluations * Step);

    /// <summary>
    /// The continuous-monitoring design of strucchange's tables: evaluated <paramref name="stepsPerWindow"/> times per
    /// window from x = 1 to x = <paramref name="period"/>, windows overlapping the history at the start.
    /// </summary>
    public static MovingWindowDesign Continuous(double window, double period, int stepsPerWindow = 100)
    {
        ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(period, 1.0);
        double step = window / stepsPerWindow;
        return new MovingWindowDesign(window, stepsPerWindow, (int)Math.Round((period - 1.0) / step), OverlapsHistory: true);
    }

    /// <summary>Throws when the design cannot be simulated.</summary>
    public void Validate()
    {
        if (!(Window > 0.0) || !double.IsFinite(Window))
        {
            throw new ArgumentOutOfRangeException(nameof(Window), Window, "The window must be a positive fraction of the history.");
        }

        ArgumentOutOfRangeException.ThrowIfLessThan(StepsPerWindow, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(Evaluations, 1);
        if (OverlapsHistory && Window > 1.0)
        {
            throw new ArgumentOutOfRangeException(nameof(Window), Window, "A window longer than the history cannot start inside it.");
        }
    }
}
