using System.CommandLine;
using ModelWatch.Cli.Commands;

namespace ModelWatch.Cli;

/// <summary>Builds the command tree and maps parse errors and failures to the documented exit codes.</summary>
public static class ModelWatchCommandLine
{
    /// <summary>Builds the root command.</summary>
    public static RootCommand CreateRoot()
    {
        var root = new RootCommand("ModelWatch: watches deployed linear regression models for drift, collinearity, residual shift and error growth");
        root.Subcommands.Add(FitCommand.Create());
        root.Subcommands.Add(MigrateCommand.Create());
        root.Subcommands.Add(ModelCommand.Create());
        root.Subcommands.Add(BaselineCommand.Create());
        root.Subcommands.Add(DaemonCommand.Create());
        root.Subcommands.Add(RunsCommand.Create());
        root.Subcommands.Add(StatusCommand.Create());
        root.Subcommands.Add(AlertsCommand.Create());
        root.Subcommands.Add(QuietCommand.Create());
        root.Subcommands.Add(ExplainCommand.Create());
        root.Subcommands.Add(Operations.CheckCommand.Create());
        root.Subcommands.Add(Operations.BacktestCommand.Create());
        root.Subcommands.Add(Demo.DemoCommand.Create());
        ValueParsers.Apply(root);
        return root;
    }

    /// <summary>Parses and runs a command line, writing to the given streams; returns the exit code.</summary>
    public static async Task<int> InvokeAsync(string[] args, TextWriter output, TextWriter error, CancellationToken cancellationToken = default)
    {
        ParseResult parse = CreateRoot().Parse(args);
        var configuration = new InvocationConfiguration { Output = output, Error = error };
        if (parse.CommandResult.Command.Name == "daemon")
        {
            // The daemon's host owns SIGTERM and Ctrl+C: it drains in-flight runs for up to its shutdown timeout and then
            // exits 0. The command line's own handler would end the process after two seconds with 143.
            configuration.ProcessTerminationTimeout = null;
        }

        if (parse.Errors.Count > 0)
        {
            foreach (var parseError in parse.Errors)
            {
                error.WriteLine($"modelwatch: {parseError.Message}");
            }

            error.WriteLine("Run 'modelwatch --help' for usage.");
            return ExitCodes.Usage;
        }

        try
        {
            return await parse.InvokeAsync(configuration, cancellationToken);
        }
        catch (OperationCanceledException)
        {
            return ExitCodes.RuntimeError;
        }
    }
}
