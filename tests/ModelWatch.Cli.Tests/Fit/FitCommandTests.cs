using System.Globalization;
using System.Text.Json;

namespace ModelWatch.Cli.Tests.Fit;

public sealed class FitCommandTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("modelwatch-fit-").FullName;

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Json_output_has_exactly_the_documented_fields()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Longley"), "--target", "y", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Output);
        string[] fields = json.RootElement.EnumerateObject().Select(p => p.Name).ToArray();
        Assert.Equal(
            ["n", "p", "rank", "intercept", "coefficients", "rss", "residual_sd", "r_squared", "adj_r_squared", "f_statistic", "f_p_value", "condition_number", "vif"],
            fields);
        JsonElement first = json.RootElement.GetProperty("coefficients")[0];
        Assert.Equal(["term", "estimate", "std_error", "t", "p_value"], first.EnumerateObject().Select(p => p.Name).ToArray());
        Assert.Equal("(intercept)", first.GetProperty("term").GetString());
        Assert.Equal(16, json.RootElement.GetProperty("n").GetInt32());
        Assert.Equal(7, json.RootElement.GetProperty("p").GetInt32());
        Assert.Equal(6, json.RootElement.GetProperty("vif").EnumerateObject().Count());
    }

    /// <summary>NIST StRD Longley certified values (TestData/NistStrd/Longley.certified.json), through the CLI's JSON.</summary>
    [Fact]
    public async Task Longley_through_the_command_line_matches_nist_certified_values()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Longley"), "--target", "y", "--format", "json");

        using var json = JsonDocument.Parse(run.Output);
        JsonElement coefficients = json.RootElement.GetProperty("coefficients");
        Assert.Equal(-3482258.63459582, coefficients[0].GetProperty("estimate").GetDouble(), 3482258.63459582 * 1e-9);
        Assert.Equal(1829.15146461355, coefficients[6].GetProperty("estimate").GetDouble(), 1829.15146461355 * 1e-9);
        Assert.Equal(455.478499142212, coefficients[6].GetProperty("std_error").GetDouble(), 455.478499142212 * 1e-9);
        Assert.Equal(304.854073561965, json.RootElement.GetProperty("residual_sd").GetDouble(), 304.854073561965 * 1e-9);
        Assert.Equal(0.995479004577296, json.RootElement.GetProperty("r_squared").GetDouble(), 1e-12);
        Assert.Equal(330.285339234588, json.RootElement.GetProperty("f_statistic").GetDouble(), 330.285339234588 * 1e-9);
    }

    /// <summary>NIST StRD Norris certified values: B0 −0.262323073774029, B1 1.00211681802045.</summary>
    [Fact]
    public async Task Norris_table_output_shows_the_certified_estimates()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Norris"), "--target", "y");

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("-0.26232307377", run.Output, StringComparison.Ordinal);
        Assert.Contains("1.0021168180204", run.Output, StringComparison.Ordinal);
        Assert.Contains("rank 2", run.Output, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Numbers_round_trip_and_non_finite_values_print_as_null()
    {
        string path = Write("exact.csv", "y,x\n2,1\n4,2\n6,3\n8,4\n");
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "y", "--no-intercept", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Output);
        JsonElement slope = json.RootElement.GetProperty("coefficients")[0];
        Assert.Equal(2.0, slope.GetProperty("estimate").GetDouble());
        Assert.Equal(JsonValueKind.Null, slope.GetProperty("t").ValueKind);
        Assert.Equal(JsonValueKind.Null, json.RootElement.GetProperty("f_statistic").ValueKind);
        Assert.Empty(json.RootElement.GetProperty("vif").EnumerateObject());
    }

    [Fact]
    public async Task Leading_and_trailing_decimal_points_are_numbers()
    {
        string path = Write("tokens.csv", "y,x\n.5,1.\n1.,2\n1.6,3.\n2.,4\n");
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "y", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Output);
        Assert.Equal(4, json.RootElement.GetProperty("n").GetInt32());
    }

    [Fact]
    public async Task Features_option_selects_columns()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Longley"), "--target", "y", "--features", "x1, x6", "--format", "json");

        using var json = JsonDocument.Parse(run.Output);
        Assert.Equal(3, json.RootElement.GetProperty("p").GetInt32());
        Assert.Equal("x6", json.RootElement.GetProperty("coefficients")[2].GetProperty("term").GetString());
    }

    [Fact]
    public async Task Missing_column_is_named()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Norris"), "--target", "y", "--features", "x,stops");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("feature column 'stops' is not in the header", run.Error, StringComparison.Ordinal);
        Assert.Empty(run.Output);
    }

    [Fact]
    public async Task Non_numeric_cell_is_reported_with_its_line_number()
    {
        string path = Write("bad.csv", "minutes,route_km\n12,3\n15,4\n17,n/a\n20,6\n");
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "minutes");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("line 4: column 'route_km' holds 'n/a', which is not a number", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Too_few_rows_is_an_error()
    {
        string path = Write("short.csv", "minutes,route_km,stops\n12,3,1\n15,4,2\n");
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "minutes");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("too few rows: 2 data row(s) for 3 parameter(s)", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Rank_deficient_file_is_fitted_with_the_aliased_column_named()
    {
        string path = Write("dup.csv", "y,a,b,a_twice\n1,1,5,2\n2,2,3,4\n4,3,8,6\n3,4,1,8\n6,5,9,10\n5,6,2,12\n");
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "y", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("rank-deficient", run.Error, StringComparison.Ordinal);
        Assert.Contains("a_twice", run.Error, StringComparison.Ordinal);
        using var json = JsonDocument.Parse(run.Output);
        Assert.Equal(3, json.RootElement.GetProperty("rank").GetInt32());
        Assert.Equal(JsonValueKind.Null, json.RootElement.GetProperty("coefficients")[3].GetProperty("estimate").ValueKind);
    }

    [Fact]
    public async Task Filip_prints_a_conditioning_warning()
    {
        string path = Write("filip.csv", PowerColumns(CliRun.NistFile("Filip"), 10));
        CliRun run = await CliRun.InvokeAsync("fit", path, "--target", "y", "--format", "json");

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("ill-conditioned", run.Error, StringComparison.Ordinal);
        using var json = JsonDocument.Parse(run.Output);
        Assert.Equal(11, json.RootElement.GetProperty("rank").GetInt32());
    }

    [Theory]
    [InlineData("fit")]
    [InlineData("fit", "file.csv")]
    [InlineData("fit", "file.csv", "--target", "y", "--format", "yaml")]
    [InlineData("no-such-command")]
    public async Task Usage_errors_exit_with_two(params string[] args)
    {
        CliRun run = await CliRun.InvokeAsync(args);

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.NotEmpty(run.Error);
    }

    [Fact]
    public async Task Missing_file_is_a_runtime_error()
    {
        CliRun run = await CliRun.InvokeAsync("fit", Path.Combine(_folder, "absent.csv"), "--target", "y");

        Assert.Equal(ExitCodes.RuntimeError, run.ExitCode);
        Assert.Contains("no such file", run.Error, StringComparison.Ordinal);
    }

    private string Write(string name, string text)
    {
        string path = Path.Combine(_folder, name);
        File.WriteAllText(path, text);
        return path;
    }

    private static string PowerColumns(string csv, int degree)
    {
        var lines = File.ReadAllLines(csv).Where(l => l.Trim().Length > 0).ToList();
        var text = new System.Text.StringBuilder("y," + string.Join(',', Enumerable.Range(1, degree).Select(k => $"x{k}")) + "\n");
        foreach (string line in lines.Skip(1))
        {
            string[] cells = line.Split(',');
            double x = double.Parse(cells[1], CultureInfo.InvariantCulture);
            text.Append(cells[0]);
            for (int k = 1; k <= degree; k++)
            {
                text.Append(',').Append(Math.Pow(x, k).ToString("R", CultureInfo.InvariantCulture));
            }

            text.Append('\n');
        }

        return text.ToString();
    }
}
