namespace ModelWatch.Cli.Tests;

/// <summary>Runs the command line in-process and captures what it prints.</summary>
internal sealed record CliRun(int ExitCode, string Output, string Error)
{
    public static async Task<CliRun> InvokeAsync(params string[] args)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        int code = await ModelWatchCommandLine.InvokeAsync(args, output, error);
        return new CliRun(code, output.ToString(), error.ToString());
    }

    public static string NistFile(string name) => Path.Combine(AppContext.BaseDirectory, "TestData", "NistStrd", name + ".csv");
}
