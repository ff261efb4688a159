using System.Text.RegularExpressions;
using System.Xml.Linq;
using ModelWatch.Testing.Repository;

namespace ModelWatch.Cli.Tests.Terminal;

/// <summary>
/// The CLI packs as the .NET tool the README tells people to install. Packing takes a minute, too slow for every
/// test run, so this checks the declarations and the README's commands against each other.
/// </summary>
public sealed partial class ToolPackageTests
{
    [Fact]
    public void The_cli_project_is_a_tool_named_modelwatch()
    {
        XElement properties = Project();

        Assert.Equal("true", Property(properties, "PackAsTool"));
        Assert.Equal("modelwatch", Property(properties, "ToolCommandName"));
        Assert.Equal("ModelWatch.Cli", Property(properties, "PackageId"));
        Assert.NotNull(Property(properties, "Version"));
    }

    [Fact]
    public void The_readme_installs_that_package_before_its_first_modelwatch_command()
    {
        string packageId = Property(Project(), "PackageId")!;
        string readme = File.ReadAllText(Path.Combine(RepositoryFiles.Root(), "README.md"));
        string[] lines = readme.Split('\n');

        int pack = Array.FindIndex(lines, l => l.Trim() == "dotnet pack src/ModelWatch.Cli -c Release -o ./artifacts");
        int install = Array.FindIndex(lines, l => l.Trim() == $"dotnet tool install --global --add-source ./artifacts {packageId}");
        int firstCommand = Array.FindIndex(lines, l => CommandLine().IsMatch(l));
        Assert.True(pack >= 0 && install > pack, "README.md has no pack-then-install commands for " + packageId);
        Assert.True(firstCommand > install, $"the first 'modelwatch' command (line {firstCommand + 1}) comes before the install (line {install + 1})");
        Assert.All(lines.Where(l => l.Contains("dotnet tool ", StringComparison.Ordinal) && l.Contains("ModelWatch", StringComparison.Ordinal)),
            l => Assert.Contains(packageId, l, StringComparison.Ordinal));
    }

    private static XElement Project() =>
        XElement.Load(Path.Combine(RepositoryFiles.Root(), "src", "ModelWatch.Cli", "ModelWatch.Cli.csproj"));

    private static string? Property(XElement project, string name) =>
        project.Elements("PropertyGroup").Elements(name).Select(e => e.Value.Trim()).FirstOrDefault();

    // An indented code line that runs the command, e.g. "    modelwatch demo [--keep]".
    [GeneratedRegex(@"^    modelwatch ")]
    private static partial Regex CommandLine();
}
