using System.Diagnostics;
using System.Net;
using System.Net.Sockets;

namespace ModelWatch.Store.Local;

/// <summary>
/// A PostgreSQL cluster created with <c>initdb</c> in a temporary folder and started with <c>pg_ctl</c> on a free
/// loopback port; run as the <c>postgres</c> user when the current user is root (initdb refuses root).
/// The demo runs on one; tests use one as their shared server, and tests that restart or stop the database use their own.
/// </summary>
public sealed class ThrowawayCluster : IAsyncDisposable
{
    private readonly string _binDirectory;
    private readonly string _root;
    private bool _running;

    private ThrowawayCluster(string binDirectory, string root, int port)
    {
        _binDirectory = binDirectory;
        _root = root;
        Port = port;
    }

    /// <summary>The loopback port the server listens on.</summary>
    public int Port { get; }

    /// <summary>Connection string for the superuser <c>postgres</c> to the <c>postgres</c> database.</summary>
    public string ConnectionString => $"Host=127.0.0.1;Port={Port};Username=postgres;Database=postgres;Timeout=15;GSS Encryption Mode=Disable";

    /// <summary>The folder holding the cluster's data, socket and log; removed when the cluster is disposed.</summary>
    public string Root => _root;

    /// <summary>The folder of the PostgreSQL binaries the cluster was started with.</summary>
    public string BinDirectory => _binDirectory;

    /// <summary>The postmaster's process id, from its pid file, or null when the server is not running.</summary>
    public int? ServerProcessId =>
        File.Exists(Path.Combine(DataDirectory, "postmaster.pid"))
        && int.TryParse(File.ReadLines(Path.Combine(DataDirectory, "postmaster.pid")).FirstOrDefault(), System.Globalization.NumberStyles.Integer, System.Globalization.CultureInfo.InvariantCulture, out int pid)
            ? pid
            : null;

    private string DataDirectory => Path.Combine(_root, "data");

    /// <summary>
    /// A cluster an earlier process started and left running (the demo's <c>--keep</c>), found again by its folder, so
    /// that disposing it stops the server and removes the folder.
    /// </summary>
    public static ThrowawayCluster Attach(string binDirectory, string root, int port) => new(binDirectory, root, port) { _running = true };

    /// <summary>Finds the folder holding <c>initdb</c> and <c>pg_ctl</c>: PATH first, then the newest /usr/lib/postgresql/*/bin.</summary>
    public static string? FindBinaries()
    {
        string path = Environment.GetEnvironmentVariable("PATH") ?? string.Empty;
        foreach (string dir in path.Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
        {
            if (File.Exists(Path.Combine(dir, "initdb")) && File.Exists(Path.Combine(dir, "pg_ctl")))
            {
                return dir;
            }
        }

        const string debianRoot = "/usr/lib/postgresql";
        if (!Directory.Exists(debianRoot))
        {
            return null;
        }

        return Directory.GetDirectories(debianRoot)
            .Select(d => (Dir: Path.Combine(d, "bin"), Version: int.TryParse(Path.GetFileName(d), out int v) ? v : 0))
            .Where(x => File.Exists(Path.Combine(x.Dir, "initdb")))
            .OrderByDescending(x => x.Version)
            .Select(x => x.Dir)
            .FirstOrDefault();
    }

    /// <summary>Creates and starts a cluster from the binaries in <paramref name="binDirectory"/>.</summary>
    public static async Task<ThrowawayCluster> StartAsync(string binDirectory, CancellationToken cancellationToken = default)
    {
        RemoveStaleFolders();
        string root = Directory.CreateTempSubdirectory(FolderPrefix).FullName;
        var cluster = new ThrowawayCluster(binDirectory, root, FreePort());
        try
        {
            if (IsRoot)
            {
                await RunAsync("chown", ["postgres:postgres", root], asPostgres: false, cancellationToken);
            }

            await cluster.PgAsync("initdb", ["-D", cluster.DataDirectory, "-U", "postgres", "--auth=trust", "--encoding=UTF8", "--locale=C.UTF-8", "--no-sync"], cancellationToken);
            await cluster.StartServerAsync(cancellationToken);
            return cluster;
        }
        catch
        {
            await cluster.DisposeAsync();
            throw;
        }
    }

    /// <summary>Starts the server (again, after <see cref="StopServerAsync"/>), on the same port and data.</summary>
    public async Task StartServerAsync(CancellationToken cancellationToken = default)
    {
        string options = $"-p {Port} -k {_root} -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200";
        await PgAsync("pg_ctl", ["-D", DataDirectory, "-l", Path.Combine(_root, "server.log"), "-w", "-t", "60", "-o", options, "start"], cancellationToken);
        _running = true;
    }

    /// <summary>Stops the server, keeping its data, so that tests can simulate a database outage.</summary>
    public async Task StopServerAsync(string mode = "fast", CancellationToken cancellationToken = default)
    {
        if (!_running)
        {
            return;
        }

        await PgAsync("pg_ctl", ["-D", DataDirectory, "-m", mode, "-w", "-t", "60", "stop"], cancellationToken);
        _running = false;
    }

    /// <summary>Stops the server and removes its folder.</summary>
    public async ValueTask DisposeAsync()
    {
        try
        {
            using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
            await StopServerAsync("immediate", timeout.Token);
        }
        catch (Exception ex) when (ex is InvalidOperationException or OperationCanceledException)
        {
            // The folder is removed below whatever state the server is in.
        }

        try
        {
            Directory.Delete(_root, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    /// <summary>Stops the server synchronously; used from process-exit handlers, where nothing can be awaited.</summary>
    public void StopNow()
    {
        if (_running)
        {
            RunAsync(Path.Combine(_binDirectory, "pg_ctl"), ["-D", DataDirectory, "-m", "immediate", "-w", "-t", "30", "stop"], IsRoot, CancellationToken.None)
                .GetAwaiter().GetResult();
            _running = false;
        }

        try
        {
            Directory.Delete(_root, recursive: true);
        }
        catch (IOException)
        {
        }
    }

    private const string FolderPrefix = "modelwatch-pg-";

    private static bool IsRoot => Environment.UserName == "root";

    /// <summary>
    /// Removes folders of earlier clusters whose server is no longer running: a test process that is killed
    /// before its exit handler finishes leaves its folder behind.
    /// </summary>
    private static void RemoveStaleFolders()
    {
        foreach (string folder in Directory.GetDirectories(Path.GetTempPath(), FolderPrefix + "*"))
        {
            string pidFile = Path.Combine(folder, "data", "postmaster.pid");
            try
            {
                bool running = File.Exists(pidFile)
                    && int.TryParse(File.ReadLines(pidFile).FirstOrDefault(), System.Globalization.NumberStyles.Integer, System.Globalization.CultureInfo.InvariantCulture, out int pid)
                    && Directory.Exists($"/proc/{pid}");
                // The age guard spares a folder another test process is still initialising.
                bool old = TimeProvider.System.GetUtcNow().UtcDateTime - Directory.GetLastWriteTimeUtc(folder) > TimeSpan.FromMinutes(30);
                if (!running && old)
                {
                    Directory.Delete(folder, recursive: true);
                }
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                // Another process may own it; it is only temporary space.
            }
        }
    }

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    private Task PgAsync(string tool, IReadOnlyList<string> arguments, CancellationToken cancellationToken) =>
        RunAsync(Path.Combine(_binDirectory, tool), arguments, IsRoot, cancellationToken);

    private static async Task RunAsync(string program, IReadOnlyList<string> arguments, bool asPostgres, CancellationToken cancellationToken)
    {
        var info = new ProcessStartInfo(asPostgres ? "runuser" : program)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        if (asPostgres)
        {
            info.ArgumentList.Add("-u");
            info.ArgumentList.Add("postgres");
            info.ArgumentList.Add("--");
            info.ArgumentList.Add(program);
        }

        foreach (string argument in arguments)
        {
            info.ArgumentList.Add(argument);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException($"could not start {program}");
        Task<string> stdout = process.StandardOutput.ReadToEndAsync(cancellationToken);
        Task<string> stderr = process.StandardError.ReadToEndAsync(cancellationToken);
        await process.WaitForExitAsync(cancellationToken);
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{Path.GetFileName(program)} {string.Join(' ', arguments)} exited with {process.ExitCode}: {await stderr}{await stdout}");
        }
    }
}
