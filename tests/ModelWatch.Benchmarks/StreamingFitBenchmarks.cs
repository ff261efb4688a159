using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using MathNet.Numerics.LinearAlgebra;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Benchmarks;

/// <summary>
/// One million rows: the streaming Householder accumulator against MathNet's dense thin QR of the same matrix,
/// and against normal-equations accumulation with a Cholesky solve (a speed reference only: it squares the
/// condition number, so ModelWatch never uses it).
/// Run: dotnet run -c Release --project tests/ModelWatch.Benchmarks -- --filter '*StreamingFit*'
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Monitoring, launchCount: 1, warmupCount: 1, iterationCount: 5)]
public class StreamingFitBenchmarks
{
    private const int Rows = 1_000_000;
    private double[] _rowMajor = [];
    private Matrix<double> _design = Matrix<double>.Build.Dense(1, 1);
    private Vector<double> _outcome = Vector<double>.Build.Dense(1);
    private DesignLayout _layout = new(["x"], "y", intercept: true);

    /// <summary>Features per row (the intercept comes on top).</summary>
    [Params(5, 10, 20, 50)]
    public int Features { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20261202);
        int stride = Features + 1;
        _rowMajor = new double[Rows * stride];
        _design = Matrix<double>.Build.Dense(Rows, Features + 1);
        _outcome = Vector<double>.Build.Dense(Rows);
        for (int i = 0; i < Rows; i++)
        {
            double y = 1.0;
            _design[i, 0] = 1.0;
            for (int j = 0; j < Features; j++)
            {
                double x = random.NextDouble() * 10.0;
                _rowMajor[(i * stride) + j] = x;
                _design[i, j + 1] = x;
                y += (j + 1) * 0.1 * x;
            }

            y += random.NextDouble() - 0.5;
            _rowMajor[(i * stride) + Features] = y;
            _outcome[i] = y;
        }

        _layout = new DesignLayout(Enumerable.Range(1, Features).Select(j => $"x{j}").ToList(), "y", intercept: true);
    }

    [Benchmark(Baseline = true, Description = "streaming Householder (ModelWatch)")]
    public double StreamingAccumulator()
    {
        var accumulator = new LeastSquaresAccumulator(_layout);
        accumulator.AddRows(_rowMajor);
        return LeastSquaresFit.Fit(accumulator.ToFactor()).ResidualSumOfSquares;
    }

    [Benchmark(Description = "MathNet dense thin QR + solve")]
    public double DenseThinQr() => _design.QR().Solve(_outcome)[0];

    [Benchmark(Description = "normal equations + Cholesky (reference only)")]
    public double NormalEquations()
    {
        int p = Features + 1;
        int stride = Features + 1;
        var xtx = new double[p * p];
        var xty = new double[p];
        var x = new double[p];
        x[0] = 1.0;
        for (int i = 0; i < Rows; i++)
        {
            int offset = i * stride;
            for (int j = 0; j < Features; j++)
            {
                x[j + 1] = _rowMajor[offset + j];
            }

            double y = _rowMajor[offset + Features];
            for (int a = 0; a < p; a++)
            {
                double xa = x[a];
                xty[a] += xa * y;
                for (int b = a; b < p; b++)
                {
                    xtx[(a * p) + b] += xa * x[b];
                }
            }
        }

        var gram = Matrix<double>.Build.Dense(p, p, (a, b) => a <= b ? xtx[(a * p) + b] : xtx[(b * p) + a]);
        return gram.Cholesky().Solve(Vector<double>.Build.Dense(xty))[0];
    }
}
