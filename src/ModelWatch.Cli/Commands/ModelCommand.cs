using System.CommandLine;

namespace ModelWatch.Cli.Commands;

/// <summary><c>modelwatch model apply|list|show|validate</c>: the model registry.</summary>
internal static class ModelCommand
{
    public static Command Create()
    {
        var command = new Command("model", "Register, list, show and validate model specs");
        command.Subcommands.Add(ModelApplyCommand.Create());
        command.Subcommands.Add(ModelListCommand.CreateList());
        command.Subcommands.Add(ModelListCommand.CreateShow());
        command.Subcommands.Add(ModelValidateCommand.Create());
        return command;
    }
}
