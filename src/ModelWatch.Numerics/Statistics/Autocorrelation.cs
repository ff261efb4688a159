namespace ModelWatch.Numerics.Statistics;

/// <summary>
/// Serial-correlation statistics of a time-ordered series: sample autocorrelations, the Durbin–Watson d
/// (Durbin &amp; Watson 1950, 1951), and the Ljung–Box (1978) and Box–Pierce (1970) portmanteau tests.
/// </summary>
public static class Autocorrelation
{
    /// <summary>
    /// Sample autocorrelations <c>r_1..r_h</c> about the series mean (the definition R's <c>acf</c> and
    /// <c>Box.test</c> use).
    /// </summary>
    public static double[] Coefficients(IReadOnlyList<double> series, int maxLag)
    {
        ArgumentNullException.ThrowIfNull(series);
        int n = series.Count;
        ArgumentOutOfRangeException.ThrowIfLessThan(maxLag, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(maxLag, n);
        double mean = series.Average();
        double c0 = series.Sum(v => (v - mean) * (v - mean));
        var r = new double[maxLag];
        for (int k = 1; k <= maxLag; k++)
        {
            double s = 0.0;
            for (int t = k; t < n; t++)
            {
                s += (series[t] - mean) * (series[t - k] - mean);
            }

            r[k - 1] = s / c0;
        }

        return r;
    }

    /// <summary>Durbin–Watson <c>d = Σ(e_t − e_{t−1})² / Σ e_t²</c> of regression residuals in time order.</summary>
    public static double DurbinWatson(IReadOnlyList<double> residuals)
    {
        ArgumentNullException.ThrowIfNull(residuals);
        double num = 0.0;
        double den = 0.0;
        for (int t = 0; t < residuals.Count; t++)
        {
            den += residuals[t] * residuals[t];
            if (t > 0)
            {
                double d = residuals[t] - residuals[t - 1];
                num += d * d;
            }
        }

        return num / den;
    }

    /// <summary>
    /// Large-sample normal score of Durbin–Watson's d, <c>z = √n (1 − d/2)</c> (positive for positive
    /// autocorrelation); the exact null depends on the design, so use it only beyond about 100 rows.
    /// </summary>
    public static double DurbinWatsonNormalScore(double d, long count) => Math.Sqrt(count) * (1.0 - (d / 2.0));

    /// <summary>Ljung–Box <c>Q = n(n+2) Σ r_k²/(n−k)</c> on h lags, p from χ²_h (minus fitted ARMA parameters, if any).</summary>
    public static StatisticalTest LjungBox(IReadOnlyList<double> series, int lags, int fittedParameters = 0)
    {
        double[] r = Coefficients(series, lags);
        return LjungBoxFromAutocorrelations(r, series.Count, fittedParameters);
    }

    /// <summary>Ljung–Box from autocorrelations already computed on <paramref name="count"/> observations.</summary>
    public static StatisticalTest LjungBoxFromAutocorrelations(IReadOnlyList<double> autocorrelations, long count, int fittedParameters = 0)
    {
        ArgumentNullException.ThrowIfNull(autocorrelations);
        double n = count;
        double q = 0.0;
        for (int k = 1; k <= autocorrelations.Count; k++)
        {
            q += autocorrelations[k - 1] * autocorrelations[k - 1] / (n - k);
        }

        q *= n * (n + 2.0);
        double df = autocorrelations.Count - fittedParameters;
        return new StatisticalTest(q, StandardDistributions.ChiSquareUpperTail(q, df), df);
    }

    /// <summary>Box–Pierce <c>Q = n Σ r_k²</c> on h lags.</summary>
    public static StatisticalTest BoxPierce(IReadOnlyList<double> series, int lags)
    {
        double[] r = Coefficients(series, lags);
        double q = series.Count * r.Sum(v => v * v);
        return new StatisticalTest(q, StandardDistributions.ChiSquareUpperTail(q, lags), lags);
    }
}
