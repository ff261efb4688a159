using MathNet.Numerics.LinearAlgebra;

namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Decides the numerical rank of a design from the SVD of its column-equilibrated R factor (the singular
/// values of X, at p×p cost) and, when rank is lost, which columns to drop: the later column of each
/// dependency, as a reader expects, falling back to column pivoting if the in-order choice disagrees with the SVD.
/// </summary>
internal sealed class RankDecision
{
    private RankDecision(double[] singularValues, int rank, double relativeTolerance, int[] kept, double[] columnNorms)
    {
        SingularValues = singularValues;
        Rank = rank;
        RelativeTolerance = relativeTolerance;
        Kept = kept;
        ColumnNorms = columnNorms;
    }

    /// <summary>Singular values of the equilibrated design, largest first.</summary>
    public double[] SingularValues { get; }

    /// <summary>The numerical rank.</summary>
    public int Rank { get; }

    /// <summary>max(n, p)·ε: singular values at or below this times σ_max count as zero.</summary>
    public double RelativeTolerance { get; }

    /// <summary>Indices of the design columns kept, ascending.</summary>
    public int[] Kept { get; }

    /// <summary>2-norms of the design columns (the column norms of R).</summary>
    public double[] ColumnNorms { get; }

    /// <summary>Scaled condition number σ_max/σ_min (+∞ when σ_min is zero).</summary>
    public double ConditionNumber =>
        SingularValues.Length == 0 ? double.NaN
        : SingularValues[^1] == 0.0 ? double.PositiveInfinity
        : SingularValues[0] / SingularValues[^1];

    public static RankDecision Decide(double[,] r, long rowCount)
    {
        int p = r.GetLength(0);
        var norms = new double[p];
        var scaled = new double[p, p];
        for (int j = 0; j < p; j++)
        {
            double s = 0.0;
            for (int i = 0; i <= j; i++)
            {
                s += r[i, j] * r[i, j];
            }

            norms[j] = Math.Sqrt(s);
            double inv = norms[j] > 0.0 ? 1.0 / norms[j] : 0.0;
            for (int i = 0; i <= j; i++)
            {
                scaled[i, j] = r[i, j] * inv;
            }
        }

        double[] sigma = Matrix<double>.Build.DenseOfArray(scaled).Svd(computeVectors: false).S.ToArray();
        double relTol = Math.Max(rowCount, p) * Precision.MachineEpsilon;
        double cut = relTol * (sigma.Length > 0 ? sigma[0] : 0.0);
        int rank = sigma.Count(s => s > cut);
        int[] kept = rank == p ? Enumerable.Range(0, p).ToArray() : ChooseColumns(scaled, rank, cut);
        return new RankDecision(sigma, rank, relTol, kept, norms);
    }

    private static int[] ChooseColumns(double[,] scaled, int rank, double cut)
    {
        int[]? inOrder = Select(scaled, rank, cut, pivot: false);
        return inOrder ?? Select(scaled, rank, cut, pivot: true)!;
    }

    /// <summary>
    /// Householder QR over the equilibrated columns. In order: keep a column when its distance from the span
    /// of the columns kept so far exceeds the cut. With pivoting: take the largest remaining column each step.
    /// Returns null when the in-order choice does not give exactly <paramref name="rank"/> columns.
    /// </summary>
    private static int[]? Select(double[,] scaled, int rank, double cut, bool pivot)
    {
        int p = scaled.GetLength(0);
        var a = (double[,])scaled.Clone();
        var kept = new List<int>(rank);
        var remaining = Enumerable.Range(0, p).ToList();
        int row = 0;
        while (remaining.Count > 0 && row < p)
        {
            int pick = pivot ? remaining.MaxBy(c => ColumnTailNorm(a, c, row)) : remaining[0];
            remaining.Remove(pick);
            double norm = ColumnTailNorm(a, pick, row);
            if (norm <= cut || (pivot && kept.Count == rank))
            {
                if (pivot)
                {
                    break;
                }

                continue;
            }

            kept.Add(pick);
            Reflect(a, pick, row, norm, remaining);
            row++;
        }

        if (kept.Count != rank)
        {
            return null;
        }

        kept.Sort();
        return [.. kept];
    }

    private static double ColumnTailNorm(double[,] a, int column, int fromRow)
    {
        double s = 0.0;
        for (int i = fromRow; i < a.GetLength(0); i++)
        {
            s += a[i, column] * a[i, column];
        }

        return Math.Sqrt(s);
    }

    private static void Reflect(double[,] a, int pivot, int row, double norm, List<int> targets)
    {
        int m = a.GetLength(0);
        double x0 = a[row, pivot];
        double alpha = x0 >= 0 ? -norm : norm;
        var v = new double[m];
        v[row] = x0 - alpha;
        for (int i = row + 1; i < m; i++)
        {
            v[i] = a[i, pivot];
        }

        double vtv = 0.0;
        for (int i = row; i < m; i++)
        {
            vtv += v[i] * v[i];
        }

        foreach (int c in targets)
        {
            double s = 0.0;
            for (int i = row; i < m; i++)
            {
                s += v[i] * a[i, c];
            }

            double f = 2.0 * s / vtv;
            for (int i = row; i < m; i++)
            {
                a[i, c] -= f * v[i];
            }
        }

        a[row, pivot] = alpha;
        for (int i = row + 1; i < m; i++)
        {
            a[i, pivot] = 0.0;
        }
    }
}
