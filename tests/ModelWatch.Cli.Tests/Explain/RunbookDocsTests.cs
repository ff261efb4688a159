using ModelWatch.Checks.Evaluation;
using ModelWatch.Daemon.Evidence;

namespace ModelWatch.Cli.Tests.Explain;

/// <summary>docs/operations.md's runbook says exactly what <c>explain</c> prints.</summary>
public sealed class RunbookDocsTests
{
    [Fact]
    public void The_runbook_in_docs_repeats_every_hint_word_for_word()
    {
        string docs = File.ReadAllText(Path.Combine(RepositoryRoot(), "docs", "operations.md"));
        string runbook = docs[docs.IndexOf("## Runbook", StringComparison.Ordinal)..];

        Assert.Contains(RunbookHints.Caution, runbook, StringComparison.Ordinal);
        Assert.Equal(["source", "data", "serving", "coefficients", "collinearity", "residuals", "error", "features"], RunbookHints.All.Select(h => h.Check));
        foreach (RunbookEntry hint in RunbookHints.All)
        {
            Assert.Contains($"### `{hint.Check}`", runbook, StringComparison.Ordinal);
            Assert.Contains("**What it means.** " + hint.Meaning, runbook, StringComparison.Ordinal);
            Assert.Contains("**How to confirm.** " + hint.Confirm, runbook, StringComparison.Ordinal);
            Assert.Contains("**What to do.** " + hint.Act, runbook, StringComparison.Ordinal);
        }
    }

    private static string RepositoryRoot()
    {
        for (DirectoryInfo? dir = new(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "ModelWatch.sln")))
            {
                return dir.FullName;
            }
        }

        throw new DirectoryNotFoundException("ModelWatch.sln not found above " + AppContext.BaseDirectory);
    }
}
