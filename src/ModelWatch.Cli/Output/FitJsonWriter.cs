using System.Text.Json;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Cli.Output;

/// <summary>
/// The JSON form of a fit, with exactly the fields scripts rely on: n, p, rank, intercept, coefficients,
/// rss, residual_sd, r_squared, adj_r_squared, f_statistic, f_p_value, condition_number, vif.
/// </summary>
internal static class FitJsonWriter
{
    public static void Write(Stream output, FitSummary fit)
    {
        using var writer = new Utf8JsonWriter(output, CliJson.Options);
        writer.WriteStartObject();
        writer.WriteNumber("n", fit.RowCount);
        writer.WriteNumber("p", fit.ParameterCount);
        writer.WriteNumber("rank", fit.Rank);
        writer.WriteBoolean("intercept", fit.Layout.Intercept);
        writer.WriteStartArray("coefficients");
        foreach (CoefficientEstimate c in fit.Coefficients)
        {
            writer.WriteStartObject();
            writer.WriteString("term", c.Term);
            JsonNumbers.Write(writer, "estimate", c.Estimate);
            JsonNumbers.Write(writer, "std_error", c.StandardError);
            JsonNumbers.Write(writer, "t", c.TStatistic);
            JsonNumbers.Write(writer, "p_value", c.PValue);
            writer.WriteEndObject();
        }

        writer.WriteEndArray();
        JsonNumbers.Write(writer, "rss", fit.ResidualSumOfSquares);
        JsonNumbers.Write(writer, "residual_sd", fit.ResidualStandardDeviation);
        JsonNumbers.Write(writer, "r_squared", fit.RSquared);
        JsonNumbers.Write(writer, "adj_r_squared", fit.AdjustedRSquared);
        JsonNumbers.Write(writer, "f_statistic", fit.FStatistic);
        JsonNumbers.Write(writer, "f_p_value", fit.FPValue);
        JsonNumbers.Write(writer, "condition_number", fit.ConditionNumber);
        writer.WriteStartObject("vif");
        foreach (string feature in fit.Layout.Features)
        {
            if (fit.VarianceInflationFactors.TryGetValue(feature, out double vif))
            {
                JsonNumbers.Write(writer, feature, vif);
            }
        }

        writer.WriteEndObject();
        writer.WriteEndObject();
        writer.Flush();
        output.WriteByte((byte)'\n');
    }
}
