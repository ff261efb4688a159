namespace ModelWatch.Numerics.Tests.Regression;

/// <summary>
/// The exact least-squares solution of a double design, in rational arithmetic: the normal equations solved
/// without rounding (exact arithmetic makes their squared condition number harmless).
/// </summary>
internal static class ExactLeastSquares
{
    public static double[] Solve(double[][] design, double[] outcome)
    {
        int n = design.Length;
        int p = design[0].Length;
        var x = new BigRational[n, p];
        var y = new BigRational[n];
        for (int i = 0; i < n; i++)
        {
            y[i] = BigRational.FromDouble(outcome[i]);
            for (int j = 0; j < p; j++)
            {
                x[i, j] = BigRational.FromDouble(design[i][j]);
            }
        }

        var a = new BigRational[p, p + 1];
        for (int r = 0; r < p; r++)
        {
            for (int c = 0; c <= p; c++)
            {
                BigRational s = BigRational.Zero;
                for (int i = 0; i < n; i++)
                {
                    s += x[i, r] * (c < p ? x[i, c] : y[i]);
                }

                a[r, c] = s;
            }
        }

        for (int col = 0; col < p; col++)
        {
            int pivot = col;
            while (a[pivot, col].IsZero)
            {
                pivot++;
            }

            for (int c = 0; c <= p; c++)
            {
                (a[col, c], a[pivot, c]) = (a[pivot, c], a[col, c]);
            }

            for (int r = 0; r < p; r++)
            {
                if (r == col || a[r, col].IsZero)
                {
                    continue;
                }

                BigRational f = a[r, col] / a[col, col];
                for (int c = col; c <= p; c++)
                {
                    a[r, c] -= f * a[col, c];
                }
            }
        }

        return Enumerable.Range(0, p).Select(j => (a[j, p] / a[j, j]).ToDouble()).ToArray();
    }
}
