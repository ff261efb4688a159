using System.Globalization;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Cli.Output;

/// <summary>The human-readable form of a fit: a coefficient table and the overall statistics.</summary>
internal static class FitTableWriter
{
    public static void Write(TextWriter output, FitSummary fit, string source)
    {
        var c = CultureInfo.InvariantCulture;
        output.WriteLine(string.Create(c, $"Least-squares fit of {fit.Layout.Outcome} on {fit.Layout.Features.Count} feature(s){(fit.Layout.Intercept ? " with intercept" : ", no intercept")} ({source})"));
        output.WriteLine(string.Create(c, $"rows {fit.RowCount}, parameters {fit.ParameterCount}, rank {fit.Rank}, residual df {fit.ResidualDegreesOfFreedom}"));
        output.WriteLine();
        int termWidth = Math.Max(12, fit.Coefficients.Max(x => x.Term.Length) + 2);
        output.WriteLine($"{"term".PadRight(termWidth)}{"estimate",22}{"std error",16}{"t",12}{"p-value",12}");
        foreach (CoefficientEstimate x in fit.Coefficients)
        {
            if (x.IsAliased)
            {
                output.WriteLine($"{x.Term.PadRight(termWidth)}{"(aliased: not estimable)",22}");
                continue;
            }

            output.WriteLine($"{x.Term.PadRight(termWidth)}{Number(x.Estimate, "G15"),22}{Number(x.StandardError, "G8"),16}{Number(x.TStatistic, "F3"),12}{PValue(x.PValue),12}");
        }

        output.WriteLine();
        output.WriteLine($"residual SD      {Number(fit.ResidualStandardDeviation, "G10")}   (RSS {Number(fit.ResidualSumOfSquares, "G10")})");
        output.WriteLine($"R²               {Number(fit.RSquared, "F6")}   adjusted {Number(fit.AdjustedRSquared, "F6")}{(fit.Layout.Intercept ? string.Empty : "   (uncentred: no intercept)")}");
        output.WriteLine($"F                {Number(fit.FStatistic, "G8")}   p-value {PValue(fit.FPValue)}");
        output.WriteLine($"condition number {Number(fit.ConditionNumber, "G6")}   (columns scaled to unit length, intercept included)");
        if (fit.VarianceInflationFactors.Count > 0)
        {
            output.WriteLine("VIF              " + string.Join("  ", fit.Layout.Features.Select(f => $"{f} {Number(fit.VarianceInflationFactors[f], "G5")}")));
        }
    }

    private static string Number(double? value, string format) =>
        value is { } v && double.IsFinite(v) ? v.ToString(format, CultureInfo.InvariantCulture) : "—";

    private static string PValue(double? value) =>
        value switch
        {
            null => "—",
            { } v when double.IsNaN(v) => "—",
            < 1e-16 => "< 1e-16",
            { } v => v.ToString("G3", CultureInfo.InvariantCulture),
        };
}
