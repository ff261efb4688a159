using ModelWatch.Numerics.Monitoring;
using ModelWatch.Numerics.Statistics;
using Xunit.Abstractions;

namespace ModelWatch.Numerics.Tests.Monitoring;

/// <summary>The simulated null of the moving-window monitors against strucchange's tables and against closed forms.</summary>
public sealed class MovingWindowNullTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(0.25, 4)]
    [InlineData(0.5, 10)]
    [InlineData(1.0, 2)]
    public void Continuous_critical_values_reproduce_strucchange_tables(double window, int period)
    {
        // Leisch, Hornik & Kuan (2000) simulated the continuous limit; 100 looks per window length approach it from
        // below (a look between grid points can only add crossings), so a few per cent lower is expected.
        MovingWindowNull simulated = MovingWindowNull.Simulate(MovingWindowDesign.Continuous(window, period, stepsPerWindow: 100), paths: 20_000, seed: 1);
        foreach ((string level, double alpha) in new[] { ("0.95", 0.05), ("0.99", 0.01) })
        {
            double table = StrucchangeCase.TableCriticalValue(window, period, level);
            double c = simulated.CriticalValue(alpha);
            output.WriteLine($"h = {window}, period {period}, level {level}: strucchange {table:F4}, simulated {c:F4} ({(c / table) - 1:P1})");
            Assert.InRange(c / table, 0.965, 1.01);
        }
    }

    [Fact]
    public void One_look_at_a_window_after_the_history_has_the_normal_critical_value()
    {
        // Z = W-increment over h minus h·(history) ~ N(0, h + h²); the unit boundary is √2 before x = e.
        const double h = 0.3;
        MovingWindowNull simulated = MovingWindowNull.Simulate(new MovingWindowDesign(h, 1, 1, OverlapsHistory: false), paths: 200_000, seed: 2);
        double exact = StandardDistributions.NormalUpperQuantile(0.025) * Math.Sqrt(h + (h * h)) / Math.Sqrt(2.0);
        Assert.InRange(simulated.CriticalValue(0.05) / exact, 0.99, 1.01);
        Assert.InRange(simulated.PValue(exact / MovingWindowNull.Spread(h)), 0.047, 0.053);
    }

    [Fact]
    public void Looking_once_per_run_needs_a_lower_critical_value_than_looking_continuously()
    {
        // Seven runs per window (a 7-day window checked daily) over two history lengths, against continuous looks.
        MovingWindowNull runs = MovingWindowNull.Simulate(new MovingWindowDesign(0.25, 7, 56, OverlapsHistory: true), 20_000, 3);
        MovingWindowNull continuous = MovingWindowNull.Simulate(new MovingWindowDesign(0.25, 280, 2240, OverlapsHistory: true), 20_000, 3);
        Assert.True(runs.CriticalValue(0.05) < continuous.CriticalValue(0.05));
    }

    [Fact]
    public void A_monitor_that_starts_after_the_history_crosses_at_least_as_often_as_one_that_overlaps_it()
    {
        var overlap = MovingWindowNull.Simulate(new MovingWindowDesign(0.5, 10, 100, OverlapsHistory: true), 20_000, 4);
        var after = MovingWindowNull.Simulate(new MovingWindowDesign(0.5, 10, 100, OverlapsHistory: false), 20_000, 4);
        Assert.True(after.CriticalValue(0.05) >= overlap.CriticalValue(0.05));
    }

    [Fact]
    public void A_larger_share_of_history_error_never_raises_the_standardized_critical_value()
    {
        // Windows of 0.01 to 1 history lengths, seven looks a window, the same horizon in history lengths: the common
        // history term, a larger share of Z's variance as h grows, makes the looks more alike, so rounding h down to a
        // grid point errs on the safe side.
        double previous = double.PositiveInfinity;
        foreach (double h in new[] { 0.01, 0.05, 0.2, 0.5, 1.0 })
        {
            int looks = (int)Math.Round(7 * 3.0 / h);
            double u = MovingWindowNull.Simulate(new MovingWindowDesign(h, 7, looks, OverlapsHistory: false), 20_000, 5).StandardizedCriticalValue(0.05);
            output.WriteLine($"h = {h}: standardized critical value {u:F4}");
            Assert.True(u <= previous * 1.01, $"h = {h}: {u} after {previous}");
            previous = u;
        }
    }

    [Fact]
    public void Simulation_is_deterministic_for_a_seed_and_cached_per_design()
    {
        var design = new MovingWindowDesign(0.1, 24, 500, OverlapsHistory: false);
        Assert.Equal(MovingWindowNull.Simulate(design, 3000, 9).CriticalValue(0.01), MovingWindowNull.Simulate(design, 3000, 9).CriticalValue(0.01));
        Assert.Same(MovingWindowNull.For(design), MovingWindowNull.For(design with { }));
    }
}
