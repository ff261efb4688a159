using System.CommandLine;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>A bad value on the command line is reported in the user's words, never with a .NET type name.</summary>
public sealed class ParseErrorTests
{
    // Types any token parses as: nothing to report.
    private static readonly Type[] Untyped = [typeof(string), typeof(bool), typeof(FileInfo)];

    public static TheoryData<string[]> BadValues()
    {
        var cases = new TheoryData<string[]>();
        foreach ((string[] path, Command command) in CommandTree.Runnable())
        {
            foreach (Option option in command.Options.Where(o => o.Arity.MaximumNumberOfValues > 0 && !Untyped.Contains(o.ValueType)))
            {
                cases.Add([.. path, .. Arguments(command, bad: false), option.Name, "notavalue"]);
            }

            if (command.Arguments.Any(a => !Untyped.Contains(a.ValueType)))
            {
                cases.Add([.. path, .. Arguments(command, bad: true)]);
            }
        }

        return cases;
    }

    [Theory]
    [MemberData(nameof(BadValues))]
    public async Task A_bad_value_is_a_usage_error_without_type_names(string[] args)
    {
        CliRun run = await CliRun.InvokeAsync(args);

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains("'notavalue'", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("System.", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("ModelWatch.", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("expected type", run.Error, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void Every_typed_option_and_argument_has_a_parser_of_its_own()
    {
        foreach ((string[] path, Command command) in CommandTree.All())
        {
            IEnumerable<Symbol> typed = command.Options.Where(o => o.Arity.MaximumNumberOfValues > 0 && !Untyped.Contains(o.ValueType)).Cast<Symbol>()
                .Concat(command.Arguments.Where(a => !Untyped.Contains(a.ValueType)));
            foreach (Symbol symbol in typed)
            {
                object? parser = symbol.GetType().GetProperty("CustomParser")!.GetValue(symbol);
                Assert.True(parser is not null, $"modelwatch {string.Join(' ', path)} {symbol.Name} has no parser that speaks the user's words");
            }
        }
    }

    [Theory]
    [InlineData("runs list --format yaml", "modelwatch: --format: 'yaml' is not one of table, json")]
    [InlineData("explain abc", "modelwatch: 'abc' is not the alert's id (a whole number)")]
    [InlineData("alerts show 12x", "modelwatch: '12x' is not an alert id (a whole number)")]
    [InlineData("runs list --limit many", "modelwatch: --limit: 'many' is not a whole number")]
    [InlineData("runs list --limit 99999999999", "modelwatch: --limit: '99999999999' is out of range (-2147483648 to 2147483647)")]
    public async Task The_message_says_what_was_expected(string line, string message)
    {
        CliRun run = await CliRun.InvokeAsync(line.Split(' '));

        Assert.Equal(ExitCodes.Usage, run.ExitCode);
        Assert.Contains(message, run.Error.Split(Environment.NewLine), StringComparer.Ordinal);
    }

    [Fact]
    public async Task Format_names_are_accepted_in_any_case()
    {
        CliRun run = await CliRun.InvokeAsync("fit", CliRun.NistFile("Norris"), "--target", "y", "--format", "JSON");

        Assert.True(run.ExitCode == ExitCodes.Ok, run.Error);
        Assert.StartsWith("{", run.Output, StringComparison.Ordinal);
    }

    // Values for the positional arguments: a plausible one each, or "notavalue" for the typed ones.
    private static IEnumerable<string> Arguments(Command command, bool bad) =>
        command.Arguments.Where(a => a.Arity.MinimumNumberOfValues > 0 || (bad && !Untyped.Contains(a.ValueType)))
            .Select(a => Untyped.Contains(a.ValueType) ? "x" : bad ? "notavalue" : "1");
}
