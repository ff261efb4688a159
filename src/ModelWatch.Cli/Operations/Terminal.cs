using ModelWatch.Cli.Output;
using Spectre.Console;

namespace ModelWatch.Cli.Operations;

/// <summary>
/// Coloured tables and progress when a person is watching the process's own terminal, plain aligned text
/// otherwise (a pipe, a file, a test's writer), so scripts never receive escape codes.
/// </summary>
internal static class Terminal
{
    /// <summary>True when <paramref name="output"/> is the process's standard output and that is a terminal.</summary>
    public static bool IsTerminal(TextWriter output) => ReferenceEquals(output, Console.Out) && !Console.IsOutputRedirected;

    /// <summary>
    /// Prints rows (the first is the header) as a table that fits the terminal (see <see cref="TextTable"/>);
    /// <paramref name="freeText"/> is the header of the column whose long text may be shortened with an ellipsis.
    /// </summary>
    public static void WriteTable(TextWriter output, IReadOnlyList<string[]> rows, string? freeText = null) =>
        TextTable.Write(output, rows, freeText);

    /// <summary>
    /// Runs <paramref name="body"/>, which calls its argument once per finished step. A progress bar is drawn on
    /// standard error while the command writes to a terminal; otherwise the steps pass silently.
    /// </summary>
    public static async Task ProgressAsync(TextWriter output, string description, int steps, Func<Action, Task> body)
    {
        if (!IsTerminal(output) || Console.IsErrorRedirected)
        {
            await body(() => { });
            return;
        }

        IAnsiConsole console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
        await console.Progress()
            .AutoClear(true)
            .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new RemainingTimeColumn())
            .StartAsync(async context =>
            {
                ProgressTask task = context.AddTask(Markup.Escape(description), maxValue: Math.Max(1, steps));
                await body(() => task.Increment(1));
            });
    }
}
