using ModelWatch.Checks.Summaries;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Calibration;

/// <summary>
/// Invented data for tests: y = β₀ + Σ βⱼ xⱼ + σ ε with independent standard normal features, and the
/// injected changes the calibration tests need. Seeded, so every figure is reproducible.
/// </summary>
public sealed class SyntheticModel
{
    private readonly Random _random;
    private double? _spare;

    public SyntheticModel(int seed, int features = 5, double sigma = 1.0)
    {
        _random = new Random(seed);
        FeatureCount = features;
        Sigma = sigma;
        Coefficients = [.. Enumerable.Range(0, features + 1).Select(i => i == 0 ? 2.0 : 0.5 + (0.25 * i))];
        Layout = new DesignLayout(Enumerable.Range(1, features).Select(i => "x" + i.ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray(), "y", intercept: true);
    }

    public int FeatureCount { get; }

    public double Sigma { get; }

    public double[] Coefficients { get; }

    public DesignLayout Layout { get; }

    /// <summary>Changes applied to the rows drawn next.</summary>
    public Shift Change { get; set; } = Shift.None;

    public double Normal()
    {
        if (_spare is { } s)
        {
            _spare = null;
            return s;
        }

        double u;
        double v;
        double r;
        do
        {
            u = (2.0 * _random.NextDouble()) - 1.0;
            v = (2.0 * _random.NextDouble()) - 1.0;
            r = (u * u) + (v * v);
        }
        while (r >= 1.0 || r == 0.0);

        double f = Math.Sqrt(-2.0 * Math.Log(r) / r);
        _spare = v * f;
        return u * f;
    }

    public (double[] X, double Y) Row()
    {
        var x = new double[FeatureCount];
        for (int j = 0; j < FeatureCount; j++)
        {
            x[j] = Normal();
        }

        Shift c = Change;
        if (c.CorrelateFeature is { } target)
        {
            x[target] = (c.Correlation * x[c.CorrelateWith]) + (Math.Sqrt(1.0 - (c.Correlation * c.Correlation)) * x[target]);
        }

        if (c.MeanShiftFeature is { } shifted)
        {
            x[shifted] += c.MeanShift;
        }

        double y = Coefficients[0];
        for (int j = 0; j < FeatureCount; j++)
        {
            double beta = Coefficients[j + 1] + (c.CoefficientFeature == j ? c.CoefficientChange : 0.0);
            y += beta * x[j];
        }

        y += (Sigma * Math.Sqrt(c.VarianceFactor) * Normal()) + (c.Bias * Sigma);
        return (x, y);
    }

    public BaselineReference Baseline(int rows, int seed = 7)
    {
        var builder = new BaselineBuilder(Layout, new BaselineBuilderOptions { Seed = seed });
        for (int i = 0; i < rows; i++)
        {
            (double[] x, double y) = Row();
            builder.AddRow(x, y);
        }

        return builder.Build(BaselineOrigin.Fitted);
    }

    public WindowSummary Window(BaselineReference baseline, int rows, int seed = 11)
    {
        var builder = new WindowSummaryBuilder(Layout, baseline, new WindowSummaryOptions { Seed = seed });
        for (int i = 0; i < rows; i++)
        {
            (double[] x, double y) = Row();
            builder.AddRow(x, y);
        }

        return builder.Build();
    }
}
