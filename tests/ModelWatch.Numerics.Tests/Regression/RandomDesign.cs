using ModelWatch.Numerics.Regression;

namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>Seeded random regression data (invented, for agreement tests only).</summary>
internal sealed class RandomDesign
{
    public RandomDesign(int rows, int features, int seed)
    {
        var random = new Random(seed);
        Features = new double[rows][];
        Outcome = new double[rows];
        for (int i = 0; i < rows; i++)
        {
            Features[i] = new double[features];
            double y = 3.0;
            for (int j = 0; j < features; j++)
            {
                double x = (random.NextDouble() * 20.0) - 10.0;
                Features[i][j] = x;
                y += (j - 2.5) * x;
            }

            Outcome[i] = y + Gaussian(random);
        }

        Layout = new DesignLayout(Enumerable.Range(1, features).Select(j => $"x{j}").ToList(), "y", intercept: true);
    }

    public double[][] Features { get; }

    public double[] Outcome { get; }

    public DesignLayout Layout { get; }

    public int Rows => Outcome.Length;

    public static double Gaussian(Random random) =>
        Math.Sqrt(-2.0 * Math.Log(1.0 - random.NextDouble())) * Math.Cos(2.0 * Math.PI * random.NextDouble());

    public double[] RowMajor(int from, int count)
    {
        int stride = Layout.Features.Count + 1;
        var block = new double[count * stride];
        for (int i = 0; i < count; i++)
        {
            Features[from + i].CopyTo(block, i * stride);
            block[(i * stride) + stride - 1] = Outcome[from + i];
        }

        return block;
    }
}
