namespace ModelWatch.Testing.Repository;

/// <summary>Files of the repository a test checks against: the root above the test's binaries, and code printed in the docs.</summary>
public static class RepositoryFiles
{
    /// <summary>The folder holding ModelWatch.sln.</summary>
    public static string Root()
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

    /// <summary>
    /// The first fenced code block in <paramref name="language"/> after <paramref name="marker"/> in a docs file, so a test
    /// runs exactly what the docs print.
    /// </summary>
    public static string CodeBlock(string docsFile, string marker, string language)
    {
        string docs = File.ReadAllText(Path.Combine(Root(), "docs", docsFile));
        string fence = "```" + language + "\n";
        int section = docs.IndexOf(marker, StringComparison.Ordinal);
        int start = section < 0 ? -1 : docs.IndexOf(fence, section, StringComparison.Ordinal);
        int end = start < 0 ? -1 : docs.IndexOf("```", start + fence.Length, StringComparison.Ordinal);
        if (section < 0 || start < 0 || end < 0)
        {
            throw new InvalidOperationException($"docs/{docsFile} has no {language} block after '{marker}'");
        }

        return docs[(start + fence.Length)..end];
    }
}
