using System.Globalization;
using ModelWatch.Checks.Findings;

namespace ModelWatch.Checks.Evaluation;

/// <summary>Number formatting and finding scaffolding shared by the checks (invariant culture throughout).</summary>
internal static class FindingText
{
    public static string Num(double v) => double.IsFinite(v) ? v.ToString("G3", CultureInfo.InvariantCulture) : "n/a";

    // Rounding first keeps a tiny negative share from printing as "-0 %".
    public static string Pct(double share) => double.IsFinite(share) ? (Math.Round(100.0 * share) + 0.0).ToString("F0", CultureInfo.InvariantCulture) + " %" : "n/a";

    public static string P(double p) =>
        double.IsNaN(p) ? "p n/a"
        : p < 1e-9 ? "p < 1e-9"
        : p < 1e-4 ? "p = " + p.ToString("0.0e0", CultureInfo.InvariantCulture)
        : "p = " + p.ToString("G2", CultureInfo.InvariantCulture);

    /// <summary>A share with two significant digits below 10 % (a limit of 0.5 % is not "0 %"), else as <see cref="Pct"/>.</summary>
    public static string Share(double share) =>
        double.IsFinite(share) && Math.Abs(share) < 0.1 && share != 0.0 ? (100.0 * share).ToString("G2", CultureInfo.InvariantCulture) + " %" : Pct(share);

    /// <summary>A significance level the way p-values print: <c>6.0e-6</c>, <c>0.01</c>.</summary>
    public static string Level(double alpha) =>
        !double.IsFinite(alpha) ? "n/a"
        : alpha < 1e-4 ? alpha.ToString("0.0e0", CultureInfo.InvariantCulture)
        : alpha.ToString("G2", CultureInfo.InvariantCulture);

    public static double? Finite(double v) => double.IsFinite(v) ? v : null;

    public static Dictionary<string, double> Details(params (string Name, double Value)[] values)
    {
        var d = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach ((string name, double value) in values)
        {
            if (double.IsFinite(value))
            {
                d[name] = value;
            }
        }

        return d;
    }

    /// <summary>Critical when significant within the budget and practical; warning when significant at the warning level.</summary>
    public static Severity Grade(double p, double alpha, double warningAlpha, bool practical)
    {
        if (double.IsNaN(p))
        {
            return Severity.Ok;
        }

        if (p < alpha && practical)
        {
            return Severity.Critical;
        }

        return p < warningAlpha || p < alpha ? Severity.Warning : Severity.Ok;
    }

    /// <summary>
    /// A CUSUM's step: critical when it alarms and the shift is practical; warning when it alarms without, or when a sum
    /// is past half its threshold (a shift may be building).
    /// </summary>
    public static Severity GradeCusum(bool alarm, bool practical, double peak, double threshold) =>
        alarm && practical ? Severity.Critical : alarm || peak > threshold / 2.0 ? Severity.Warning : Severity.Ok;

    public static Finding Skip(string check, string statistic, string reason, string explanation, string? subject = null) => new()
    {
        Check = check,
        Subject = subject,
        Statistic = statistic,
        Skipped = true,
        SkipReason = reason,
        Explanation = explanation,
    };

    public static string Fmt(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
