using System.Globalization;
using System.Text.Json;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>A NIST StRD linear regression dataset with its certified values (TestData/NistStrd, see PROVENANCE.md).</summary>
internal sealed class NistDataset
{
    private NistDataset(string name, double[][] design, double[] outcome, DesignLayout layout, JsonElement certified)
    {
        Name = name;
        Design = design;
        Outcome = outcome;
        Layout = layout;
        Certified = certified;
    }

    public string Name { get; }

    /// <summary>Feature rows in the certified raw basis (powers of x for the polynomial sets), without the intercept column.</summary>
    public double[][] Design { get; }

    public double[] Outcome { get; }

    public DesignLayout Layout { get; }

    public JsonElement Certified { get; }

    public double[] CertifiedEstimates => Parameters().Select(p => p.GetProperty("estimate").GetDouble()).ToArray();

    public double[] CertifiedStandardDeviations => Parameters().Select(p => p.GetProperty("std_dev").GetDouble()).ToArray();

    public double CertifiedResidualSd => Certified.GetProperty("residual_sd").GetDouble();

    public double CertifiedRSquared => Certified.GetProperty("r_squared").GetDouble();

    public double? CertifiedF =>
        Certified.GetProperty("anova").GetProperty("regression").GetProperty("f_statistic") is { ValueKind: JsonValueKind.Number } f ? f.GetDouble() : null;

    public double CertifiedRss => Certified.GetProperty("anova").GetProperty("residual").GetProperty("sum_of_squares").GetDouble();

    public static NistDataset Load(string name)
    {
        string folder = Path.Combine(AppContext.BaseDirectory, "TestData", "NistStrd");
        using var json = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, name + ".certified.json")));
        JsonElement certified = json.RootElement.Clone();
        string[] lines = File.ReadAllLines(Path.Combine(folder, name + ".csv")).Where(l => l.Trim().Length > 0).ToArray();
        string[] header = lines[0].Split(',');
        bool intercept = certified.GetProperty("intercept").GetBoolean();
        int? degree = certified.GetProperty("polynomial_degree").ValueKind == JsonValueKind.Number
            ? certified.GetProperty("polynomial_degree").GetInt32()
            : null;
        var rows = new List<double[]>();
        var outcome = new List<double>();
        foreach (string line in lines.Skip(1))
        {
            double[] cells = line.Split(',').Select(c => double.Parse(c, NumberStyles.Float, CultureInfo.InvariantCulture)).ToArray();
            outcome.Add(cells[0]);
            rows.Add(degree is { } d ? Enumerable.Range(1, d).Select(k => Math.Pow(cells[1], k)).ToArray() : cells[1..]);
        }

        List<string> features = degree is { } deg
            ? Enumerable.Range(1, deg).Select(k => k == 1 ? "x" : $"x^{k}").ToList()
            : header[1..].ToList();
        return new NistDataset(name, [.. rows], [.. outcome], new DesignLayout(features, "y", intercept), certified);
    }

    public AugmentedFactor Accumulate(int blockRows = LeastSquaresAccumulator.DefaultBlockRows)
    {
        var accumulator = new LeastSquaresAccumulator(Layout, NonFiniteValuePolicy.Fail, blockRows);
        for (int i = 0; i < Outcome.Length; i++)
        {
            accumulator.AddRow(Design[i], Outcome[i]);
        }

        return accumulator.ToFactor();
    }

    private JsonElement.ArrayEnumerator Parameters() => Certified.GetProperty("parameters").EnumerateArray();
}
