using System.CommandLine;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>Help of every command states each default once, in one form.</summary>
public sealed class HelpTests
{
    public static TheoryData<string[]> Commands()
    {
        var commands = new TheoryData<string[]>();
        foreach ((string[] path, Command _) in CommandTree.All())
        {
            commands.Add(path);
        }

        return commands;
    }

    [Theory]
    [MemberData(nameof(Commands))]
    public async Task No_help_line_states_a_default_twice(string[] path)
    {
        CliRun run = await CliRun.InvokeAsync([.. path, "--help"]);

        Assert.Equal(ExitCodes.Ok, run.ExitCode);
        foreach (string line in run.Output.Split('\n'))
        {
            int defaults = line.Split("default", StringSplitOptions.None).Length - 1;
            Assert.True(defaults <= 1, $"modelwatch {string.Join(' ', path)} --help: {line.Trim()}");
        }
    }

    [Fact]
    public void No_description_repeats_a_default_the_option_prints_itself()
    {
        foreach ((string[] path, Command command) in CommandTree.All())
        {
            foreach (Option option in command.Options.Where(o => o.HasDefaultValue))
            {
                Assert.False(option.Description?.Contains("default", StringComparison.OrdinalIgnoreCase) ?? false,
                    $"modelwatch {string.Join(' ', path)} {option.Name}: '{option.Description}' names a default that help prints as [default: …]");
            }
        }
    }

    [Fact]
    public async Task The_format_option_shows_the_names_it_accepts()
    {
        CliRun run = await CliRun.InvokeAsync("runs", "list", "--help");

        Assert.Contains("--format <table|json>", run.Output, StringComparison.Ordinal);
    }
}
