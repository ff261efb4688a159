using System.CommandLine;
using ModelWatch.Cli.Csv;
using ModelWatch.Cli.Output;
using ModelWatch.Numerics.Regression;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch fit FILE.csv --target COL [--features a,b] [--no-intercept] [--format table|json]</c>.</summary>
internal static class FitCommand
{
    public static Command Create()
    {
        var file = new Argument<FileInfo>("file") { Description = "CSV file with a header row" };
        var target = new Option<string>("--target", "-t") { Description = "Outcome column", Required = true };
        var features = new Option<string?>("--features", "-f") { Description = "Comma-separated feature columns (default: every other column)" };
        var noIntercept = new Option<bool>("--no-intercept") { Description = "Fit through the origin" };
        var format = new Option<OutputFormat>("--format") { Description = "table or json", DefaultValueFactory = _ => OutputFormat.Table };
        var command = new Command("fit", "Fit a linear regression to a CSV file by Householder QR and print the fit summary")
        {
            file, target, features, noIntercept, format,
        };
        command.SetAction(parse => Run(
            parse.GetRequiredValue(file),
            parse.GetRequiredValue(target),
            parse.GetValue(features),
            !parse.GetValue(noIntercept),
            parse.GetValue(format),
            parse.InvocationConfiguration.Output,
            parse.InvocationConfiguration.Error));
        return command;
    }

    private static int Run(FileInfo file, string target, string? featureList, bool intercept, OutputFormat format, TextWriter output, TextWriter error)
    {
        if (!file.Exists)
        {
            error.WriteLine($"modelwatch fit: {file.FullName}: no such file");
            return ExitCodes.RuntimeError;
        }

        List<string>? features = featureList?.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries).ToList();
        AugmentedFactor factor;
        try
        {
            factor = CsvDesignReader.Read(file.FullName, target, features, intercept);
        }
        catch (Exception ex) when (ex is CsvFormatException or ArgumentException or IOException)
        {
            error.WriteLine($"modelwatch fit: {ex.Message}");
            return ExitCodes.RuntimeError;
        }

        int p = factor.Layout.ParameterCount;
        if (factor.RowCount <= p)
        {
            error.WriteLine($"modelwatch fit: {file.Name}: too few rows: {factor.RowCount} data row(s) for {p} parameter(s); at least {p + 1} are needed to estimate the residual variance");
            return ExitCodes.RuntimeError;
        }

        FitSummary fit = LeastSquaresFit.Fit(factor);
        if (fit.RankDeficiency is { } deficiency)
        {
            error.WriteLine($"modelwatch fit: warning: the design is rank-deficient (rank {fit.Rank} of {p}): {deficiency.Message}; aliased terms are not estimated");
        }

        foreach (string warning in fit.Warnings)
        {
            error.WriteLine($"modelwatch fit: warning: {warning}");
        }

        if (format == OutputFormat.Json)
        {
            output.Flush();
            using var buffer = new MemoryStream();
            FitJsonWriter.Write(buffer, fit);
            output.Write(System.Text.Encoding.UTF8.GetString(buffer.ToArray()));
        }
        else
        {
            FitTableWriter.Write(output, fit, file.Name);
        }

        return ExitCodes.Ok;
    }
}
