using System.Collections.Concurrent;
using ModelWatch.Numerics.Randomness;

namespace ModelWatch.Numerics.Monitoring;

/// <summary>
/// The null distribution of a moving-window monitor's crossing statistic
/// <c>S = max_k |Z(x_k)| / √(2·log₊ x_k)</c>, where under no change the process (moving estimates, one component; or
/// OLS-MOSUM) tends to <c>Z(x) = [W(x) − W(x − h)] − h·W(1)</c> for a standard Brownian motion W on the history's
/// time scale (Chu, Hornik &amp; Kuan 1995; Leisch, Hornik &amp; Kuan 2000). Simulated on the design's own evaluation
/// times, so a monitor looked at once per run gets critical values for exactly that — lower than the continuous
/// tables, which assume a look at every observation — and for any window, horizon and size, beyond the range
/// strucchange tabulates. The critical value for size α is the (1 − α) quantile of S. S is kept divided by Z's
/// standard deviation after the history, <c>√(h(1 + h))</c>, so that a monitor whose window holds a varying number
/// of rows can scale the boundary to each run's own h.
/// </summary>
public sealed class MovingWindowNull
{
    /// <summary>Simulation seed of <see cref="For"/>, so every process gets the same critical values.</summary>
    public const ulong DefaultSeed = 20261202;

    /// <summary>Normal draws <see cref="For"/> spends per design (about a second on one core).</summary>
    public const double WorkBudget = 1.2e8;

    private static readonly ConcurrentDictionary<MovingWindowDesign, Lazy<MovingWindowNull>> Cache = new();
    private readonly double[] _sorted;

    private MovingWindowNull(MovingWindowDesign design, double[] sorted)
    {
        Design = design;
        _sorted = sorted;
    }

    /// <summary>The design simulated.</summary>
    public MovingWindowDesign Design { get; }

    /// <summary>Simulated paths.</summary>
    public int Paths => _sorted.Length;

    /// <summary>
    /// The null distribution for a design, simulated once per process with <see cref="DefaultSeed"/> and as many paths
    /// as <see cref="WorkBudget"/> allows (2,000 to 20,000), then kept.
    /// </summary>
    public static MovingWindowNull For(MovingWindowDesign design)
    {
        ArgumentNullException.ThrowIfNull(design);
        design.Validate();
        int paths = (int)Math.Clamp(WorkBudget / (design.Evaluations + design.StepsPerWindow), 2_000, 20_000);
        return Cache.GetOrAdd(design, d => new Lazy<MovingWindowNull>(() => Simulate(d, paths, DefaultSeed))).Value;
    }

    /// <summary>Simulates <paramref name="paths"/> paths; the result depends only on the design, the path count and the seed.</summary>
    public static MovingWindowNull Simulate(MovingWindowDesign design, int paths, ulong seed)
    {
        ArgumentNullException.ThrowIfNull(design);
        design.Validate();
        ArgumentOutOfRangeException.ThrowIfLessThan(paths, 100);
        int n = design.Evaluations;
        int r = design.StepsPerWindow;
        double h = design.Window;
        double sdStep = Math.Sqrt(design.Step);
        var inverseBoundary = new double[n];
        for (int k = 0; k < n; k++)
        {
            inverseBoundary[k] = 1.0 / Math.Sqrt(2.0 * MonitoringBoundary.LogPlus(1.0 + ((k + 1) * design.Step)));
        }

        var statistics = new double[paths];
        const int blocks = 64;
        Parallel.For(0, blocks, block =>
        {
            var random = new Xoshiro256(Xoshiro256.Substream(seed, (ulong)block));
            var ring = new double[r];
            for (int path = block; path < paths; path += blocks)
            {
                // The r increments before the first evaluation: the end of the history (overlapping) or rows after it.
                double windowSum = 0.0;
                for (int i = 0; i < r; i++)
                {
                    ring[i] = sdStep * random.NextNormal();
                    windowSum += ring[i];
                }

                double history = design.OverlapsHistory
                    ? windowSum + (Math.Sqrt(1.0 - h) * random.NextNormal())
                    : random.NextNormal();
                double offset = h * history;
                double max = 0.0;
                int slot = 0;
                for (int k = 0; k < n; k++)
                {
                    double increment = sdStep * random.NextNormal();
                    windowSum += increment - ring[slot];
                    ring[slot] = increment;
                    slot = slot + 1 == r ? 0 : slot + 1;
                    double s = Math.Abs(windowSum - offset) * inverseBoundary[k];
                    if (s > max)
                    {
                        max = s;
                    }
                }

                statistics[path] = max;
            }
        });

        // Kept per unit of Z's spread after the history.
        double scale = Spread(h);
        for (int i = 0; i < statistics.Length; i++)
        {
            statistics[i] /= scale;
        }

        Array.Sort(statistics);
        return new MovingWindowNull(design, statistics);
    }

    /// <summary>Z's standard deviation after the history, <c>√(h(1 + h))</c>, for a window of h history lengths.</summary>
    public static double Spread(double window) => Math.Sqrt(window * (1.0 + window));

    /// <summary>The critical value c of size α, in the process's units for the design's window: the (1 − α) quantile of S.</summary>
    public double CriticalValue(double alpha) => StandardizedCriticalValue(alpha) * Spread(Design.Window);

    /// <summary>The critical value of size α per unit of <see cref="Spread"/>.</summary>
    public double StandardizedCriticalValue(double alpha)
    {
        if (!(alpha > 0.0 && alpha < 1.0))
        {
            throw new ArgumentOutOfRangeException(nameof(alpha), alpha, "The size must lie strictly between 0 and 1.");
        }

        int index = Math.Clamp((int)Math.Ceiling((1.0 - alpha) * _sorted.Length) - 1, 0, _sorted.Length - 1);
        return _sorted[index];
    }

    /// <summary>
    /// Monte Carlo p-value <c>(1 + #{S ≥ s})/(paths + 1)</c> of a standardized statistic (the process over
    /// <see cref="Spread"/> and over its unit boundary <c>√(2·log₊ x)</c>): how often, with no change, the process reaches it
    /// somewhere over the horizon.
    /// </summary>
    public double PValue(double standardizedStatistic)
    {
        int index = Array.BinarySearch(_sorted, standardizedStatistic);
        if (index < 0)
        {
            index = ~index;
        }
        else
        {
            while (index > 0 && _sorted[index - 1] == standardizedStatistic)
            {
                index--;
            }
        }

        return (1.0 + _sorted.Length - index) / (_sorted.Length + 1.0);
    }
}
