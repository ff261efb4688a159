using ModelWatch.Numerics.LinearAlgebra;

namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Folds a block of rows into an upper-triangular factor: replaces <c>T</c> by the R factor of
/// <c>[T; B]</c> with one Householder reflection per column. Only the block's rows and the matching
/// row of <c>T</c> take part in each reflection, so the cost is about 2·rows·k² flops and no memory is allocated.
/// </summary>
internal static class HouseholderUpdate
{
    /// <summary>
    /// Eliminates <paramref name="rows"/> rows stored column-major in <paramref name="block"/>
    /// (column <c>j</c> at <c>block[j*stride .. j*stride+rows]</c>) into the row-major k×k upper-triangular
    /// <paramref name="factor"/>. The block is overwritten.
    /// </summary>
    public static void Apply(Span<double> factor, int k, Span<double> block, int stride, int rows)
    {
        if (rows == 0)
        {
            return;
        }

        for (int j = 0; j < k; j++)
        {
            Span<double> colJ = block.Slice(j * stride, rows);
            double sigma = VectorKernels.Dot(colJ, colJ);
            if (sigma == 0.0)
            {
                continue;
            }

            ref double diagonal = ref factor[(j * k) + j];
            double x0 = diagonal;
            double norm = Math.Sqrt((x0 * x0) + sigma);

            // Choosing alpha with the sign opposite to x0 keeps v0 = x0 − alpha free of cancellation.
            double alpha = x0 >= 0.0 ? -norm : norm;
            double v0 = x0 - alpha;
            double beta = 2.0 / ((v0 * v0) + sigma);
            for (int c = j + 1; c < k; c++)
            {
                Span<double> colC = block.Slice(c * stride, rows);
                ref double tjc = ref factor[(j * k) + c];
                double f = beta * ((v0 * tjc) + VectorKernels.Dot(colJ, colC));
                tjc -= f * v0;
                VectorKernels.SubtractScaled(colC, f, colJ);
            }

            diagonal = alpha;
        }
    }
}
