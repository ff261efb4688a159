using System.CommandLine;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>Every command of the tree that runs something, with its path of names from the root.</summary>
internal static class CommandTree
{
    public static IEnumerable<(string[] Path, Command Command)> Runnable()
    {
        RootCommand root = ModelWatchCommandLine.CreateRoot();
        return Walk([], root).Where(c => c.Command.Action is not null);
    }

    public static IEnumerable<(string[] Path, Command Command)> All() => Walk([], ModelWatchCommandLine.CreateRoot());

    private static IEnumerable<(string[] Path, Command Command)> Walk(string[] path, Command command)
    {
        yield return (path, command);
        foreach (Command subcommand in command.Subcommands)
        {
            foreach ((string[] Path, Command Command) child in Walk([.. path, subcommand.Name], subcommand))
            {
                yield return child;
            }
        }
    }
}
