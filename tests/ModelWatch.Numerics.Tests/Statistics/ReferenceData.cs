namespace ModelWatch.Numerics.Tests.Statistics;

/// <summary>
/// Data sets shared by the statistics tests, with their published sources. TestData/References/statistics.R restates
/// them and recomputes the expected values the tests assert.
/// </summary>
internal static class ReferenceData
{
    /// <summary>
    /// Paper smoothness measured by laboratories A–D, the k-sample example of Scholz &amp; Stephens (1987), K-sample
    /// Anderson–Darling tests, JASA 82(399):918–924; taken from the tests of the R package cmstatr, which reproduce the
    /// paper.
    /// </summary>
    public static readonly double[] LabA = [38.7, 41.5, 43.8, 44.5, 45.5, 46.0, 47.7, 58.0];

    public static readonly double[] LabB = [39.2, 39.3, 39.7, 41.4, 41.8, 42.9, 43.3, 45.8];

    public static readonly double[] LabC = [34.0, 35.0, 39.0, 40.0, 43.0, 43.0, 44.0, 45.0];

    public static readonly double[] LabD = [34.0, 34.8, 34.8, 35.4, 37.2, 37.8, 41.2, 42.8];

    /// <summary>
    /// Small two-sample example (n = 25, m = 20) invented for these tests; it has no published source.
    /// </summary>
    public static readonly double[] KsX = [0.61, 0.29, 0.06, 0.59, -1.73, -0.74, 0.51, -0.56, 0.39, 1.64, 0.05, -0.06, 0.64, -0.82, 0.37, 1.77, 1.09, -1.28, 2.36, 1.31, 1.05, -0.32, -0.4, 1.06, -2.47];

    public static readonly double[] KsY = [2.2, 1.66, 1.38, 0.2, 0.36, 0, 0.96, 1.56, 0.44, 1.5, -0.3, 0.66, 2.31, 3.29, -0.27, -0.37, 0.38, 0.7, 0.52, -0.71];

    /// <summary>
    /// R's <c>datasets::lh</c>: luteinizing hormone in 48 blood samples at 10-minute intervals (Diggle 1990, Time
    /// Series: A Biostatistical Introduction, Oxford, Table A.1, series 3). statistics.R checks this copy against R's.
    /// </summary>
    public static readonly double[] Lh = [2.4, 2.4, 2.4, 2.2, 2.1, 1.5, 2.3, 2.3, 2.5, 2.0, 1.9, 1.7, 2.2, 1.8, 3.2, 3.2, 2.7, 2.2, 2.2, 1.9, 1.9, 1.8, 2.7, 3.0, 2.3, 2.0, 2.0, 2.9, 2.9, 2.7, 2.7, 2.3, 2.6, 2.4, 1.8, 1.7, 1.5, 1.4, 2.1, 3.3, 3.5, 3.5, 3.1, 2.6, 2.1, 3.4, 3.0, 2.9];

    /// <summary>
    /// Consumption Y on income X, n = 30: Gujarati, Basic Econometrics, Table 11.3 (the heteroscedasticity examples of
    /// ch. 11; Gujarati &amp; Porter 2009, 5e). Typed from memory; the book's Breusch–Pagan Θ = 5.2140 (also from
    /// memory) is reproduced exactly, which confirms both.
    /// </summary>
    public static readonly double[] ConsumptionY = [55, 65, 70, 80, 79, 84, 98, 95, 90, 75, 74, 110, 113, 125, 108, 115, 140, 120, 145, 130, 152, 144, 175, 180, 135, 140, 178, 191, 137, 189];

    public static readonly double[] ConsumptionX = [80, 100, 85, 110, 120, 115, 130, 140, 125, 90, 105, 160, 150, 165, 145, 180, 225, 200, 240, 185, 220, 210, 245, 260, 190, 205, 265, 270, 230, 250];

    /// <summary>
    /// US personal savings (Y) on disposable personal income (X), 1970–1995, billions of dollars: Gujarati &amp; Porter
    /// 2009, Basic Econometrics 5e, Table 8.10 (Table 8.9 in earlier editions), the Chow test example of §8.7. The 1982
    /// and 1995 rows are from memory; the set reproduces the book's RSS₁ = 1785.032, RSS₂ = 10,005.22, RSS = 23,248.30
    /// and F = 10.69.
    /// </summary>
    public static readonly double[] SavingsY = [61, 68.6, 63.6, 89.6, 97.6, 104.4, 96.4, 92.5, 112.6, 130.1, 161.8, 199.1, 205.5, 167, 235.7, 206.2, 196.5, 168.4, 189.1, 187.8, 208.7, 246.4, 272.6, 214.4, 189.4, 249.3];

    public static readonly double[] SavingsX = [727.1, 790.2, 855.3, 965, 1054.2, 1159.2, 1273, 1401.4, 1580.1, 1769.5, 1973.3, 2200.2, 2347.3, 2522.4, 2810, 3002, 3187.6, 3363.1, 3640.8, 3894.5, 4166.8, 4343.7, 4613.7, 4790.2, 5021.7, 5320.8];
}
