using System.Globalization;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Monitoring;

/// <summary>
/// One monitoring case printed by R's strucchange (TestData/Strucchange/monitoring.R → monitoring.out): its data,
/// settings, critical value, first crossing, and per monitored observation the process and the boundary.
/// </summary>
internal sealed class StrucchangeCase
{
    private static readonly Lazy<IReadOnlyList<string[]>> Lines = new(() =>
        [.. File.ReadAllLines(Path.Combine(Folder, "monitoring.out")).Where(l => l.Length > 0).Select(l => l.Split('|'))]);

    public static string Folder => Path.Combine(AppContext.BaseDirectory, "TestData", "Strucchange");

    public required string Name { get; init; }

    public required string Type { get; init; }

    public required double Window { get; init; }

    public required double Alpha { get; init; }

    public required double Period { get; init; }

    public required int History { get; init; }

    public required double CriticalValue { get; init; }

    public required int? Breakpoint { get; init; }

    public required double Sigma { get; init; }

    /// <summary>Observation k (1-based) → boundary value.</summary>
    public required IReadOnlyDictionary<int, double> Boundary { get; init; }

    /// <summary>Observation k → process values (one per coefficient for ME, one otherwise).</summary>
    public required IReadOnlyDictionary<int, double[]> Process { get; init; }

    /// <summary>Observation k → coefficient-standardized ME components (ME cases only).</summary>
    public required IReadOnlyDictionary<int, double[]> CoefficientProcess { get; init; }

    public required DesignLayout Layout { get; init; }

    /// <summary>Feature rows (without the intercept column).</summary>
    public required double[][] Features { get; init; }

    public required double[] Outcome { get; init; }

    public static StrucchangeCase Load(string name)
    {
        var mine = Lines.Value.Where(l => l[0] == name).ToList();
        string Field(string field) => mine.Single(l => l[1] == field)[3];
        Dictionary<int, double[]> Series(string field) =>
            mine.Where(l => l[1] == field).ToDictionary(l => int.Parse(l[2], CultureInfo.InvariantCulture), l => l[3].Split(',').Select(Parse).ToArray());
        string breakpoint = Field("breakpoint");
        (DesignLayout layout, double[][] features, double[] outcome) = Data(name);
        return new StrucchangeCase
        {
            Name = name,
            Type = Field("type"),
            Window = Parse(Field("h")),
            Alpha = Parse(Field("alpha")),
            Period = Parse(Field("period")),
            History = int.Parse(Field("history"), CultureInfo.InvariantCulture),
            CriticalValue = Parse(Field("critval")),
            Breakpoint = breakpoint == "NA" ? null : int.Parse(breakpoint, CultureInfo.InvariantCulture),
            Sigma = Parse(Field("sigma")),
            Boundary = Series("boundary").ToDictionary(kv => kv.Key, kv => kv.Value[0]),
            Process = Series("process"),
            CoefficientProcess = Series("coefficient_process"),
            Layout = layout,
            Features = features,
            Outcome = outcome,
        };
    }

    /// <summary>strucchange's tabulated moving-window critical value for (h, period, level).</summary>
    public static double TableCriticalValue(double window, int period, string level)
    {
        string key = string.Create(CultureInfo.InvariantCulture, $"{window},{period},{level}");
        return Parse(Lines.Value.Single(l => l[0] == "table" && l[2] == key)[3]);
    }

    /// <summary>R's OLS-CUSUM critical value for a size.</summary>
    public static IEnumerable<(double Alpha, double CriticalValue)> CusumCriticalValues() =>
        Lines.Value.Where(l => l[0] == "cusumcrit").Select(l => (Parse(l[1]), Parse(l[3])));

    private static (DesignLayout, double[][], double[]) Data(string name)
    {
        (string file, string outcome, string[] features, bool intercept) = name switch
        {
            _ when name.StartsWith("nile", StringComparison.Ordinal) => ("nile.csv", "y", Array.Empty<string>(), true),
            _ when name.StartsWith("seatbelt", StringComparison.Ordinal) => ("seatbelt.csv", "y", new[] { "ylag1", "ylag12" }, true),
            _ when name.StartsWith("slope", StringComparison.Ordinal) => ("slope-change.csv", "y", ["x1", "x2"], true),
            _ => ("level-shift.csv", "v", ["z1", "z2"], false),
        };
        string[] lines = File.ReadAllLines(Path.Combine(Folder, file)).Where(l => l.Length > 0).ToArray();
        string[] header = lines[0].Split(',').Select(h => h.Trim('"')).ToArray();
        double[][] rows = [.. lines.Skip(1).Select(l => l.Split(',').Select(Parse).ToArray())];
        int y = Array.IndexOf(header, outcome);
        int[] x = [.. features.Select(f => Array.IndexOf(header, f))];
        return (new DesignLayout(features, outcome, intercept), [.. rows.Select(r => x.Select(i => r[i]).ToArray())], [.. rows.Select(r => r[y])]);
    }

    private static double Parse(string text) => double.Parse(text, NumberStyles.Float, CultureInfo.InvariantCulture);
}
