using System.Globalization;

namespace ModelWatch.Calibration;

/// <summary>Detection delays of one scenario at one ratio.</summary>
public sealed record DetectionResult(Cadence Cadence, Scenario Scenario, int Cap, IReadOnlyList<DetectionTrial> Trials)
{
    /// <summary>Delays, with trials not caught within the cap counted as cap + 1.</summary>
    public int[] Delays => [.. Trials.Select(t => t.Delay ?? (Cap + 1)).Order()];

    public int Median => Delays[(Delays.Length - 1) / 2];

    /// <summary>95th percentile (nearest rank).</summary>
    public int P95 => Delays[(int)Math.Ceiling(0.95 * Delays.Length) - 1];

    public int Caught => Trials.Count(t => t.Delay is not null);

    /// <summary>Share of trials whose alert named the changed subject without another subject of the check named first.</summary>
    public double NamedShare => (double)Trials.Count(t => t.Delay is not null && !t.Misnamed) / Trials.Count;

    /// <summary>Alerts opened before the change, over all trials (false by construction).</summary>
    public int AlertsBefore => Trials.Sum(t => t.AlertsBefore.Count);

    /// <summary>Those alerts by check, subject and statistic.</summary>
    public string AlertsBeforeByKey => AlertsBefore == 0 ? "0" : string.Create(CultureInfo.InvariantCulture, $"{AlertsBefore}: ") + string.Join(", ", Trials.SelectMany(t => t.AlertsBefore).GroupBy(k => k).Select(g => g.Count() == 1 ? g.Key : $"{g.Key} ×{g.Count()}"));

    public string Row(TimeSpan every)
    {
        string hours(int runs) => string.Create(CultureInfo.InvariantCulture, $"{runs * every.TotalHours:0} h");
        string p95 = P95 > Cap ? $"> {Cap}" : P95.ToString(CultureInfo.InvariantCulture);
        string target = Cadence.Ratio == 7 ? string.Create(CultureInfo.InvariantCulture, $"≤ {Scenario.Target.Median} ({Scenario.Target.P95})") : "—";
        return string.Create(CultureInfo.InvariantCulture, $"| {Cadence.Label} | {Scenario.Description} | {Scenario.Check} | {Median} ({p95}) | {hours(Median)} | {target} | {Caught}/{Trials.Count} | {NamedShare:P0} | {AlertsBeforeByKey} |");
    }

    public const string Header = "| ratio | change | check | median delay, runs (95th pct.) | median, hours | target | caught within cap | named right | alerts before the change |\n|---|---|---|---|---|---|---|---|---|";
}
