using System.Globalization;
using System.Text.Json;
using ModelWatch.Store.Local;

namespace ModelWatch.Cli.Demo;

/// <summary>
/// The throwaway clusters that <c>demo --keep</c> left running, one small JSON file each under
/// <c>&lt;temp&gt;/modelwatch-demo/kept/</c> (binaries, folder, port, server pid, connection string), so that
/// <c>demo --stop</c> finds them again from another process, stops their servers and removes their folders.
/// </summary>
internal static class KeptDemoDatabases
{
    private static readonly AsyncLocal<string?> OtherFolder = new();

    public static string Folder => OtherFolder.Value ?? Path.Combine(Path.GetTempPath(), "modelwatch-demo", "kept");

    /// <summary>Keeps the state files in another folder for the calling flow, so a test never stops a person's kept demo.</summary>
    internal static IDisposable UseFolder(string folder)
    {
        string? before = OtherFolder.Value;
        OtherFolder.Value = folder;
        return new FolderScope(() => OtherFolder.Value = before);
    }

    /// <summary>Records a cluster left running; returns the state file's path.</summary>
    public static string Remember(ThrowawayCluster cluster)
    {
        ArgumentNullException.ThrowIfNull(cluster);
        Directory.CreateDirectory(Folder);
        string path = Path.Combine(Folder, cluster.Port.ToString(CultureInfo.InvariantCulture) + ".json");
        var entry = new KeptDemoDatabase(cluster.BinDirectory, cluster.Root, cluster.Port, cluster.ServerProcessId, cluster.ConnectionString);
        File.WriteAllText(path, JsonSerializer.Serialize(entry, Json));
        return path;
    }

    /// <summary>Stops and removes every kept demo database; returns how many it found.</summary>
    public static async Task<int> StopAllAsync(TextWriter output, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(output);
        if (!Directory.Exists(Folder))
        {
            return 0;
        }

        int found = 0;
        foreach (string path in Directory.GetFiles(Folder, "*.json").Order(StringComparer.Ordinal))
        {
            cancellationToken.ThrowIfCancellationRequested();
            KeptDemoDatabase? entry = Read(path);
            if (entry is null || !Path.GetFileName(entry.Root).StartsWith("modelwatch-pg-", StringComparison.Ordinal))
            {
                // Only folders the demo itself created are ever removed.
                output.WriteLine($"Ignored {path}: not a state file the demo wrote; remove it by hand.");
                continue;
            }

            found++;
            bool wasRunning = entry.ProcessId is { } pid && Directory.Exists($"/proc/{pid.ToString(CultureInfo.InvariantCulture)}");
            await using (ThrowawayCluster.Attach(entry.BinDirectory, entry.Root, entry.Port))
            {
                // Disposing stops the server and removes its folder.
            }

            File.Delete(path);
            output.WriteLine(wasRunning
                ? $"Stopped the kept demo database on port {entry.Port} and removed {entry.Root}."
                : $"The kept demo database on port {entry.Port} was no longer running; removed {entry.Root}.");
        }

        return found;
    }

    private static KeptDemoDatabase? Read(string path)
    {
        try
        {
            return JsonSerializer.Deserialize<KeptDemoDatabase>(File.ReadAllText(path), Json);
        }
        catch (JsonException)
        {
            return null;
        }
    }

    private static readonly JsonSerializerOptions Json = new() { PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower, WriteIndented = true };

    private sealed class FolderScope(Action restore) : IDisposable
    {
        public void Dispose() => restore();
    }
}
