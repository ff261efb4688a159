using System.CommandLine;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// <c>modelwatch baseline fit|import|list|show|diff|activate</c>: a model's deployed coefficients and reference
/// statistics, kept as versions of which one is active (the one every check compares with).
/// </summary>
internal static class BaselineCommand
{
    public static Command Create()
    {
        var command = new Command("baseline", "Store, inspect and choose a model's baselines (each change is a new version; one version is active)");
        command.Subcommands.Add(BaselineFitCommand.Create());
        command.Subcommands.Add(BaselineImportCommand.Create());
        command.Subcommands.Add(BaselineListCommand.Create());
        command.Subcommands.Add(BaselineShowCommand.Create());
        command.Subcommands.Add(BaselineDiffCommand.Create());
        command.Subcommands.Add(BaselineActivateCommand.Create());
        return command;
    }
}
