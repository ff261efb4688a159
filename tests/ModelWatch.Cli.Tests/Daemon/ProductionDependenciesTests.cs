using System.Text.Json;
using ModelWatch.Testing.Repository;

namespace ModelWatch.Cli.Tests.Daemon;

/// <summary>What the production executable carries, read from its committed lock file (every direct and transitive package).</summary>
public sealed class ProductionDependenciesTests
{
    [Fact]
    public void The_executable_carries_no_container_client()
    {
        string lockFile = Path.Combine(RepositoryFiles.Root(), "src", "ModelWatch.Cli", "packages.lock.json");
        using JsonDocument document = JsonDocument.Parse(File.ReadAllText(lockFile));
        string[] packages = [.. document.RootElement.GetProperty("dependencies").EnumerateObject().SelectMany(framework => framework.Value.EnumerateObject()).Select(p => p.Name)];

        Assert.Contains("Npgsql", packages);
        Assert.DoesNotContain(packages, p => p.StartsWith("Testcontainers", StringComparison.OrdinalIgnoreCase)
            || p.StartsWith("Docker.DotNet", StringComparison.OrdinalIgnoreCase)
            || p.StartsWith("SSH.NET", StringComparison.OrdinalIgnoreCase)
            || p.Contains("BouncyCastle", StringComparison.OrdinalIgnoreCase));
    }
}
