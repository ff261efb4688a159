using System.Globalization;
using ModelWatch.Numerics.Distributions;
using ModelWatch.Numerics.LinearAlgebra;

namespace ModelWatch.Numerics.Regression;

/// <summary>
/// Reads a complete fit summary off an augmented factor <c>T</c>: coefficients by back substitution,
/// standard errors from the rows of <c>R⁻¹</c>, rank from the SVD of the equilibrated p×p factor. Never forms
/// the normal equations and never touches the raw rows. The factor's columns are first scaled by powers of two to
/// order one (exact, and QR and back substitution are equivariant under it), so sums of squares neither overflow for
/// values near 1e160 nor underflow for values near 1e-200, and every result is scaled back exactly: a problem multiplied
/// by 2^k gives the same digits, scaled by 2^k.
/// </summary>
public static class LeastSquaresFit
{
    /// <summary>A scaled condition number at or above this loses more than half of double precision's digits.</summary>
    public const double IllConditionedThreshold = 1e8;

    /// <summary>Fits the model whose rows were folded into <paramref name="factor"/>.</summary>
    /// <exception cref="ColumnScaleException">A coefficient, a standard error or the residual SD does not fit in double precision.</exception>
    public static FitSummary Fit(AugmentedFactor factor)
    {
        ArgumentNullException.ThrowIfNull(factor);
        int[] exponents = ColumnExponents(factor);
        if (exponents.All(e => e == 0))
        {
            return FitScaled(factor, factor, exponents);
        }

        int k = factor.Width;
        double[] scaled = factor.ToRowMajor();
        for (int i = 0; i < k; i++)
        {
            for (int j = i; j < k; j++)
            {
                scaled[(i * k) + j] = Math.ScaleB(scaled[(i * k) + j], -exponents[j]);
            }
        }

        FitSummary fit = FitScaled(AugmentedFactor.FromRowMajor(factor.Layout, factor.RowCount, scaled, factor.Columns), factor, exponents);
        return Unscale(fit, exponents);
    }

    /// <summary>Per augmented column, the power of two of its largest entry (0 for a zero column), clamped to normal scales.</summary>
    private static int[] ColumnExponents(AugmentedFactor factor)
    {
        int k = factor.Width;
        var exponents = new int[k];
        for (int j = 0; j < k; j++)
        {
            double largest = 0.0;
            for (int i = 0; i <= j; i++)
            {
                largest = Math.Max(largest, Math.Abs(factor[i, j]));
            }

            exponents[j] = largest > 0.0 ? Math.Clamp(Math.ILogB(largest), -1000, 1000) : 0;
        }

        return exponents;
    }

    /// <summary>A fit of the scaled factor in the original columns' units (coefficient j scales by 2^(e_y − e_j)).</summary>
    private static FitSummary Unscale(FitSummary fit, int[] e)
    {
        DesignLayout layout = fit.Layout;
        int p = layout.ParameterCount;
        int ey = e[p];
        var coefficients = new CoefficientEstimate[p];
        for (int j = 0; j < p; j++)
        {
            CoefficientEstimate c = fit.Coefficients[j];
            double? estimate = c.Estimate is { } b ? Math.ScaleB(b, ey - e[j]) : null;
            double? se = c.StandardError is { } s ? Math.ScaleB(s, ey - e[j]) : null;
            if ((estimate is { } be && !double.IsFinite(be) && double.IsFinite(c.Estimate!.Value)) || (se is { } ss && double.IsInfinity(ss) && double.IsFinite(c.StandardError!.Value)))
            {
                throw new ColumnScaleException(layout.Terms[j], "its coefficient or standard error, in the units of the outcome over this column,");
            }

            coefficients[j] = c with { Estimate = estimate, StandardError = se };
        }

        var covariance = new double[p, p];
        for (int i = 0; i < p; i++)
        {
            for (int j = 0; j < p; j++)
            {
                covariance[i, j] = Math.ScaleB(fit.Covariance[i, j], (2 * ey) - e[i] - e[j]);
            }
        }

        double sd = Math.ScaleB(fit.ResidualStandardDeviation, ey);
        if (double.IsInfinity(sd))
        {
            throw new ColumnScaleException(layout.Outcome, "the residual standard deviation");
        }

        // The sums of squares may exceed double precision where their square roots do not: they are reported as +∞ then.
        return new FitSummary
        {
            Layout = fit.Layout,
            Factor = fit.Factor,
            Rank = fit.Rank,
            RankTolerance = fit.RankTolerance,
            RankDeficiency = fit.RankDeficiency,
            Coefficients = coefficients,
            Covariance = covariance,
            ResidualSumOfSquares = Math.ScaleB(fit.ResidualSumOfSquares, 2 * ey),
            ResidualDegreesOfFreedom = fit.ResidualDegreesOfFreedom,
            ResidualStandardDeviation = sd,
            TotalSumOfSquares = Math.ScaleB(fit.TotalSumOfSquares, 2 * ey),
            RSquared = fit.RSquared,
            AdjustedRSquared = fit.AdjustedRSquared,
            FStatistic = fit.FStatistic,
            FPValue = fit.FPValue,
            ConditionNumber = fit.ConditionNumber,
            SingularValues = fit.SingularValues,
            VarianceInflationFactors = fit.VarianceInflationFactors,
            Warnings = fit.Warnings,
        };
    }

    private static FitSummary FitScaled(AugmentedFactor factor, AugmentedFactor original, int[] exponents)
    {
        DesignLayout layout = factor.Layout;
        int p = layout.ParameterCount;
        long n = factor.RowCount;
        double[,] r = Block(factor, Enumerable.Range(0, p).ToArray());
        RankDecision decision = RankDecision.Decide(r, n);
        int[] kept = decision.Kept;
        int rank = kept.Length;

        // With dropped columns, refactor [X_kept | y] from T itself: its R factor is the QR of T's kept columns.
        // With nothing estimable (no rows at all), every residual is the outcome itself.
        AugmentedFactor? reduced = rank == p ? factor : rank > 0 ? Reduce(factor, kept) : null;
        double[,] rk = reduced is null ? new double[0, 0] : Block(reduced, Enumerable.Range(0, rank).ToArray());
        double[] c = Enumerable.Range(0, rank).Select(i => reduced![i, rank]).ToArray();
        double rss = reduced?.ResidualSumOfSquares ?? Enumerable.Range(0, p + 1).Sum(i => factor[i, p] * factor[i, p]);
        long df = n - rank;
        double s2 = df > 0 ? rss / df : double.NaN;

        double[] b = rank > 0 ? UpperTriangular.Solve(rk, c) : [];
        double[,] rinv = rank > 0 ? UpperTriangular.Invert(rk) : new double[0, 0];
        var covariance = new double[p, p];
        for (int i = 0; i < p; i++)
        {
            for (int j = 0; j < p; j++)
            {
                covariance[i, j] = double.NaN;
            }
        }

        var coefficients = new CoefficientEstimate[p];
        var position = new int[p];
        Array.Fill(position, -1);
        for (int a = 0; a < rank; a++)
        {
            position[kept[a]] = a;
        }

        for (int a = 0; a < rank; a++)
        {
            for (int bIdx = 0; bIdx < rank; bIdx++)
            {
                double dot = 0.0;
                for (int m = Math.Max(a, bIdx); m < rank; m++)
                {
                    dot += rinv[a, m] * rinv[bIdx, m];
                }

                covariance[kept[a], kept[bIdx]] = s2 * dot;
            }
        }

        for (int j = 0; j < p; j++)
        {
            int a = position[j];
            if (a < 0)
            {
                coefficients[j] = new CoefficientEstimate(layout.Terms[j], null, null, null, null);
                continue;
            }

            double se = Math.Sqrt(covariance[j, j]);
            double t = b[a] / se;
            coefficients[j] = new CoefficientEstimate(layout.Terms[j], b[a], se, t, TailProbability.StudentTTwoSided(t, df));
        }

        double tss = TotalSumOfSquares(factor);
        double r2 = tss > 0 ? 1.0 - (rss / tss) : double.NaN;
        int modelDf = rank - (layout.Intercept && position[0] >= 0 ? 1 : 0);
        double adjustment = layout.Intercept ? (n - 1.0) / df : (double)n / df;
        double adjR2 = df > 0 ? 1.0 - ((1.0 - r2) * adjustment) : double.NaN;
        double f = modelDf > 0 && df > 0 ? (tss - rss) / modelDf / s2 : double.NaN;

        return new FitSummary
        {
            Layout = layout,
            Factor = original,
            Rank = rank,
            RankTolerance = decision.RelativeTolerance,
            RankDeficiency = rank == p ? null : DescribeDeficiency(factor, r, decision, exponents),
            Coefficients = coefficients,
            Covariance = covariance,
            ResidualSumOfSquares = rss,
            ResidualDegreesOfFreedom = df,
            ResidualStandardDeviation = Math.Sqrt(s2),
            TotalSumOfSquares = tss,
            RSquared = r2,
            AdjustedRSquared = adjR2,
            FStatistic = f,
            FPValue = TailProbability.FisherUpper(f, modelDf, df),
            ConditionNumber = decision.ConditionNumber,
            SingularValues = decision.SingularValues,
            VarianceInflationFactors = VarianceInflation(layout, rk, kept),
            Warnings = Warn(decision),
        };
    }

    /// <summary>
    /// Total sum of squares from the last column of T: <c>‖y‖² = Σ T[i,p]²</c>; with an intercept (column 0)
    /// the intercept-only fit leaves <c>‖y‖² − T[0,p]²</c>.
    /// </summary>
    private static double TotalSumOfSquares(AugmentedFactor factor)
    {
        int p = factor.Layout.ParameterCount;
        double s = 0.0;
        for (int i = factor.Layout.Intercept ? 1 : 0; i <= p; i++)
        {
            s += factor[i, p] * factor[i, p];
        }

        return s;
    }

    private static double[,] Block(AugmentedFactor factor, int[] columns)
    {
        int m = columns.Length;
        var r = new double[m, m];
        for (int i = 0; i < m; i++)
        {
            for (int j = i; j < m; j++)
            {
                r[i, j] = factor[i, columns[j]];
            }
        }

        return r;
    }

    private static AugmentedFactor Reduce(AugmentedFactor factor, int[] kept)
    {
        DesignLayout layout = factor.Layout;
        int k = layout.Width;
        int p = layout.ParameterCount;
        int[] columns = [.. kept, p];
        int w = columns.Length;
        var block = new double[w * k];
        for (int j = 0; j < w; j++)
        {
            for (int i = 0; i < k; i++)
            {
                block[(j * k) + i] = factor[i, columns[j]];
            }
        }

        var t = new double[w * w];
        HouseholderUpdate.Apply(t, w, block, k, k);
        var features = kept.Where(c => !layout.Intercept || c > 0).Select(c => layout.Terms[c]).ToList();
        var reducedLayout = new DesignLayout(features, layout.Outcome, layout.Intercept && kept.Length > 0 && kept[0] == 0);
        return AugmentedFactor.FromRowMajor(reducedLayout, factor.RowCount, t, factor.Columns);
    }

    private static Dictionary<string, double> VarianceInflation(DesignLayout layout, double[,] rk, int[] kept)
    {
        var vifs = new Dictionary<string, double>(StringComparer.Ordinal);
        if (!layout.Intercept || kept.Length == 0 || kept[0] != 0)
        {
            return vifs;
        }

        foreach (string feature in layout.Features)
        {
            vifs[feature] = double.PositiveInfinity;
        }

        // R22, the factor of the centred features, is the trailing block of R once the intercept leads.
        int q = kept.Length - 1;
        if (q == 0)
        {
            return vifs;
        }

        var r22 = new double[q, q];
        for (int i = 0; i < q; i++)
        {
            for (int j = i; j < q; j++)
            {
                r22[i, j] = rk[i + 1, j + 1];
            }
        }

        double[] rowNorm2 = UpperTriangular.InverseGramDiagonal(r22);
        for (int j = 0; j < q; j++)
        {
            double colNorm2 = 0.0;
            for (int i = 0; i <= j; i++)
            {
                colNorm2 += r22[i, j] * r22[i, j];
            }

            vifs[layout.Terms[kept[j + 1]]] = colNorm2 * rowNorm2[j];
        }

        return vifs;
    }

    private static List<string> Warn(RankDecision decision)
    {
        var warnings = new List<string>();
        double kappa = decision.ConditionNumber;
        if (double.IsFinite(kappa) && kappa >= IllConditionedThreshold)
        {
            warnings.Add(string.Create(
                CultureInfo.InvariantCulture,
                $"the column-equilibrated design is ill-conditioned (condition number {kappa:G3}): up to {Math.Log10(kappa):F0} of about 16 significant digits may be lost, so treat the estimates and standard errors with care"));
        }

        return warnings;
    }

    private static RankDeficiency DescribeDeficiency(AugmentedFactor factor, double[,] r, RankDecision decision, int[] exponents)
    {
        DesignLayout layout = factor.Layout;
        int p = layout.ParameterCount;
        var keptSet = new HashSet<int>(decision.Kept);
        var aliased = Enumerable.Range(0, p).Where(j => !keptSet.Contains(j)).ToList();
        var reasons = new List<string>();
        if (factor.RowCount < p)
        {
            reasons.Add(string.Create(CultureInfo.InvariantCulture, $"only {factor.RowCount} rows for {p} parameters"));
        }

        foreach (int j in aliased)
        {
            reasons.Add(ExplainAliased(factor, r, decision, j, exponents));
        }

        return new RankDeficiency(aliased.Select(j => layout.Terms[j]).ToList(), reasons);
    }

    private static string ExplainAliased(AugmentedFactor factor, double[,] r, RankDecision decision, int column, int[] exponents)
    {
        DesignLayout layout = factor.Layout;
        string term = layout.Terms[column];
        int featureIndex = column - layout.FirstFeatureColumn;
        if (decision.ColumnNorms[column] == 0.0)
        {
            return $"column '{term}' is zero in every row";
        }

        if (layout.Intercept && featureIndex >= 0 && featureIndex < factor.Columns.Count && factor.Columns[featureIndex].IsConstant)
        {
            return string.Create(CultureInfo.InvariantCulture, $"column '{term}' is constant ({factor.Columns[featureIndex].Minimum:R}) in every row, so it duplicates the intercept");
        }

        // Express the column through the kept ones: solve min ‖R_K a − R_j‖ on the small factor.
        int[] kept = decision.Kept;
        int p = r.GetLength(0);
        var design = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(p, kept.Length, (i, a) => r[i, kept[a]]);
        var target = MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense(p, i => r[i, column]);
        var weights = kept.Length > 0 ? design.QR().Solve(target) : MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense(0);
        var parts = new List<string>();
        for (int a = 0; a < kept.Length; a++)
        {
            double share = Math.Abs(weights[a]) * decision.ColumnNorms[kept[a]] / decision.ColumnNorms[column];
            if (share > 1e-8)
            {
                // The weights relate scaled columns; in the columns' own units they carry the ratio of the scales.
                double weight = Math.ScaleB(weights[a], exponents[column] - exponents[kept[a]]);
                parts.Add(string.Create(CultureInfo.InvariantCulture, $"{weight:G6}·{layout.Terms[kept[a]]}"));
            }
        }

        return parts.Count == 0
            ? $"column '{term}' adds nothing to the columns before it"
            : $"column '{term}' is an exact linear combination of other columns ({term} = {string.Join(" + ", parts)})";
    }
}
