using System.Globalization;
using MathNet.Numerics.Distributions;

namespace ModelWatch.Calibration;

/// <summary>False critical alerts over simulated model-years, with exact intervals.</summary>
public sealed record FalseAlarmResult(Cadence Cadence, int ModelYears, int RunsPerYear, IReadOnlyList<(int Trial, string Key)> Alerts)
{
    /// <summary>False critical alerts per model-year.</summary>
    public double Rate => (double)Alerts.Count / ModelYears;

    /// <summary>Exact (Garwood) 95 % interval of the yearly rate, from the Poisson count.</summary>
    public (double Low, double High) RateInterval
    {
        get
        {
            int k = Alerts.Count;
            double low = k == 0 ? 0.0 : ChiSquared.InvCDF(2 * k, 0.025) / 2.0;
            double high = ChiSquared.InvCDF(2 * (k + 1), 0.975) / 2.0;
            return (low / ModelYears, high / ModelYears);
        }
    }

    /// <summary>Model-years with at least one false alert.</summary>
    public int YearsWithAlert => Alerts.Select(a => a.Trial).Distinct().Count();

    /// <summary>Clopper–Pearson 95 % interval of the share of model-years with at least one false alert.</summary>
    public (double Low, double High) YearShareInterval
    {
        get
        {
            int k = YearsWithAlert;
            int n = ModelYears;
            double low = k == 0 ? 0.0 : Beta.InvCDF(k, n - k + 1, 0.025);
            double high = k == n ? 1.0 : Beta.InvCDF(k + 1, n - k, 0.975);
            return (low, high);
        }
    }

    public string Row()
    {
        (double lo, double hi) = RateInterval;
        (double ylo, double yhi) = YearShareInterval;
        string which = Alerts.Count == 0 ? "—" : string.Join(", ", Alerts.GroupBy(a => a.Key).Select(g => g.Count() == 1 ? g.Key : $"{g.Key} ×{g.Count()}"));
        return string.Create(CultureInfo.InvariantCulture, $"| {Cadence.Label} | {ModelYears} | {RunsPerYear * ModelYears:N0} | {Alerts.Count} | {Rate:F2} [{lo:F2}, {hi:F2}] | {YearsWithAlert}/{ModelYears} [{ylo:F2}, {yhi:F2}] | {which} |");
    }

    public const string Header = "| ratio | model-years | runs | false critical alerts | per model-year [95 % Poisson] | years with one [95 % binomial] | which |\n|---|---|---|---|---|---|---|";
}
