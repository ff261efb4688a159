using ModelWatch.Numerics.Monitoring;
using ModelWatch.Numerics.Regression;
using Xunit.Abstractions;

namespace ModelWatch.Numerics.Tests.Monitoring;

/// <summary>
/// The monitors against R's strucchange 1.5-3 (R 4.2.2), value by value: the history fit, the process at every
/// monitored observation, the boundary with strucchange's critical value, and the first crossing. Data: the Nile's
/// flow and the UK seatbelt regression (both ship with R), and two invented data sets written by the same script
/// (TestData/Strucchange/monitoring.R; its output monitoring.out is the reference).
/// </summary>
public sealed class StrucchangeMonitoringTests(ITestOutputHelper output)
{
    /// <summary>Agreement asked of every process and boundary value: 9 significant digits, or 1e-9 near zero.</summary>
    private const double Digits = 1e-9;

    [Theory]
    [InlineData("nile-cusum")]
    [InlineData("seatbelt-cusum")]
    [InlineData("slope-cusum")]
    [InlineData("level-cusum")]
    public void The_OLS_CUSUM_monitor_matches_strucchange(string name)
    {
        StrucchangeCase reference = StrucchangeCase.Load(name);
        (double[] errors, double sigma) = HistoryErrors(reference);
        double c = MonitoringBoundary.CusumCriticalValue(reference.Alpha);
        AssertClose(reference.CriticalValue, c, 1e-7, "critical value");

        // strucchange's process starts with the history's own residual sum (zero with an intercept).
        double sum = errors.Take(reference.History).Sum();
        int? crossing = null;
        for (int k = reference.History + 1; k <= errors.Length; k++)
        {
            sum += errors[k - 1];
            double process = ResidualSumProcess.Value(sum, sigma, reference.History);
            double boundary = MonitoringBoundary.Cusum(reference.CriticalValue, (double)k / reference.History);
            AssertClose(reference.Process[k][0], process, Digits, $"process at {k}");
            AssertClose(reference.Boundary[k], boundary, Digits, $"boundary at {k}");
            crossing ??= Math.Abs(process) > boundary ? k : null;
        }

        Assert.Equal(reference.Breakpoint, crossing);
        output.WriteLine($"{name}: first crossing {crossing?.ToString(System.Globalization.CultureInfo.InvariantCulture) ?? "none"}, as strucchange");
    }

    [Theory]
    [InlineData("nile-mosum")]
    [InlineData("seatbelt-mosum")]
    [InlineData("slope-mosum")]
    [InlineData("level-mosum")]
    public void The_OLS_MOSUM_monitor_matches_strucchange(string name)
    {
        StrucchangeCase reference = StrucchangeCase.Load(name);
        (double[] errors, double sigma) = HistoryErrors(reference);
        int window = (int)Math.Floor(reference.Window * reference.History);
        int? crossing = null;
        for (int k = reference.History + 1; k <= errors.Length; k++)
        {
            double sum = 0.0;
            for (int i = k - window; i < k; i++)
            {
                sum += errors[i];
            }

            double process = ResidualSumProcess.Value(sum, sigma, reference.History);
            double boundary = MonitoringBoundary.MovingWindow(reference.CriticalValue, (double)k / reference.History);
            AssertClose(reference.Process[k][0], process, Digits, $"process at {k}");
            AssertClose(reference.Boundary[k], boundary, Digits, $"boundary at {k}");
            crossing ??= Math.Abs(process) > boundary ? k : null;
        }

        Assert.Equal(reference.Breakpoint, crossing);
    }

    [Theory]
    [InlineData("nile-me")]
    [InlineData("seatbelt-me")]
    [InlineData("slope-me")]
    [InlineData("slope-me-h1")]
    [InlineData("level-me")]
    public void The_moving_estimates_monitor_matches_strucchange_in_both_forms(string name)
    {
        StrucchangeCase reference = StrucchangeCase.Load(name);
        (FitSummary history, _) = HistoryFit(reference);
        double[] b = [.. history.Coefficients.Select(x => x.Estimate!.Value)];
        int window = (int)Math.Floor(reference.Window * reference.History);
        double running = 0.0;
        int? crossing = null;
        double worst = 0.0;
        for (int k = reference.History + 1; k <= reference.Outcome.Length; k++)
        {
            var accumulator = new LeastSquaresAccumulator(reference.Layout);
            for (int i = k - window; i < k; i++)
            {
                accumulator.AddRow(reference.Features[i], reference.Outcome[i]);
            }

            MovingEstimatesValue value = MovingEstimates.Evaluate(accumulator.ToFactor(), b, history.ResidualStandardDeviation, reference.History)
                ?? throw new InvalidOperationException($"singular window at {k}");
            for (int j = 0; j < b.Length; j++)
            {
                AssertClose(reference.Process[k][j], value.SymmetricRoot[j], Digits, $"process[{j}] at {k}");
                AssertClose(reference.CoefficientProcess[k][j], value.Standardized[j], Digits, $"coefficient process[{j}] at {k}");
                worst = Math.Max(worst, Math.Abs(value.SymmetricRoot[j] - reference.Process[k][j]) / (1.0 + Math.Abs(reference.Process[k][j])));
            }

            double boundary = MonitoringBoundary.MovingWindow(reference.CriticalValue, (double)k / reference.History);
            AssertClose(reference.Boundary[k], boundary, Digits, $"boundary at {k}");

            // strucchange compares the largest |component| seen so far with the boundary.
            running = Math.Max(running, value.SymmetricRoot.Max(Math.Abs));
            crossing ??= running > boundary ? k : null;
        }

        Assert.Equal(reference.Breakpoint, crossing);
        output.WriteLine($"{name}: largest relative difference from strucchange's process {worst:E1}");
    }

    [Fact]
    public void The_OLS_CUSUM_critical_values_solve_the_crossing_probability_as_in_strucchange()
    {
        foreach ((double alpha, double c) in StrucchangeCase.CusumCriticalValues())
        {
            AssertClose(c, MonitoringBoundary.CusumCriticalValue(alpha), 1e-7, $"critical value at α = {alpha}");
            Assert.Equal(alpha, MonitoringBoundary.CusumCrossingProbability(MonitoringBoundary.CusumCriticalValue(alpha)), 12);
        }
    }

    private static (FitSummary Fit, double Sigma) HistoryFit(StrucchangeCase reference)
    {
        var accumulator = new LeastSquaresAccumulator(reference.Layout);
        for (int i = 0; i < reference.History; i++)
        {
            accumulator.AddRow(reference.Features[i], reference.Outcome[i]);
        }

        FitSummary fit = LeastSquaresFit.Fit(accumulator.ToFactor());
        AssertClose(reference.Sigma, fit.ResidualStandardDeviation, 1e-11, "history residual SD");
        return (fit, fit.ResidualStandardDeviation);
    }

    private static (double[] Errors, double Sigma) HistoryErrors(StrucchangeCase reference)
    {
        (FitSummary fit, double sigma) = HistoryFit(reference);
        double[] b = [.. fit.Coefficients.Select(x => x.Estimate!.Value)];
        int offset = reference.Layout.Intercept ? 1 : 0;
        double[] errors = new double[reference.Outcome.Length];
        for (int i = 0; i < errors.Length; i++)
        {
            double predicted = offset == 1 ? b[0] : 0.0;
            for (int j = 0; j < reference.Features[i].Length; j++)
            {
                predicted += b[j + offset] * reference.Features[i][j];
            }

            errors[i] = reference.Outcome[i] - predicted;
        }

        return (errors, sigma);
    }

    private static void AssertClose(double expected, double actual, double tolerance, string what) =>
        Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Max(1.0, Math.Abs(expected)), $"{what}: expected {expected:R}, got {actual:R}");
}
