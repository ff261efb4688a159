using System.Diagnostics;
using System.Globalization;
using ModelWatch.Store.Benchmarks;
using ModelWatch.Testing.Postgres;
using Npgsql;

// Usage: dotnet run -c Release --project tests/ModelWatch.Store.Benchmarks -- [--rows N] [--rounds K] [--parallel P] [--peak-only]
// The server comes from MODELWATCH_TEST_POSTGRES, else a throwaway cluster is started (and stopped at the end).
long rows = Option("--rows", 1_000_000);
int rounds = (int)Option("--rounds", 5);
int parallel = (int)Option("--parallel", 2);
bool peakOnly = args.Contains("--peak-only");

PostgresServer server = await PostgresServer.GetAsync();
await using (NpgsqlDataSource admin = NpgsqlDataSource.Create(server.ConnectionString))
{
    await using NpgsqlCommand exists = admin.CreateCommand("SELECT count(*) FROM pg_database WHERE datname = 'mw_bench'");
    if ((long)(await exists.ExecuteScalarAsync())! == 0)
    {
        await using NpgsqlCommand create = admin.CreateCommand("CREATE DATABASE mw_bench");
        await create.ExecuteNonQueryAsync();
    }
}

await using NpgsqlDataSource source = server.OpenDataSource("mw_bench");
var setup = Stopwatch.StartNew();
await BenchTable.EnsureAsync(source, rows);
Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"table {BenchTable.Name(rows)}: {rows:N0} rows x {BenchTable.Features} float8 features ready in {setup.Elapsed.TotalSeconds:F1} s ({server.Origin})"));

var runs = new Runs(source, rows);
await runs.BaselineAsync();
if (peakOnly)
{
    long allocatedBefore = GC.GetTotalAllocatedBytes(precise: true);
    await runs.SummaryReadAsync(build: true);
    long allocated = GC.GetTotalAllocatedBytes(precise: true) - allocatedBefore;
    int collections = GC.CollectionCount(0);
    Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
        $"peak working set after (c) over {rows:N0} rows: {Environment.WorkingSet / 1048576.0:F1} MiB now, {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576.0:F1} MiB peak"));

    // What grows with the window is short-lived garbage (the driver's asynchronous socket reads), not what is kept.
    Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
        $"  allocated during the read and fit: {allocated / 1048576.0:F1} MiB, gen-0 collections: {collections}; managed heap after a full collection: {GC.GetTotalMemory(forceFullCollection: true) / 1048576.0:F1} MiB"));
    return 0;
}

var variants = new (string Name, Func<Task<double>> Run)[]
{
    ("(a) bare sequential read", runs.BareReadAsync),
    ("(r) reader into accumulator only", runs.AccumulatorReadAsync),
    ("(b) read into summaries", () => runs.SummaryReadAsync(build: false)),
    ("(c) (b) + fit", () => runs.SummaryReadAsync(build: true)),
    ($"(p) (c) with parallel_reads={parallel}", () => runs.SummaryReadAsync(build: true, parallel)),
};
foreach (var variant in variants)
{
    await variant.Run(); // warm-up: JIT, pool, buffer cache
}

var times = variants.Select(_ => new List<double>()).ToArray();
for (int round = 0; round < rounds; round++)
{
    for (int v = 0; v < variants.Length; v++)
    {
        var watch = Stopwatch.StartNew();
        await variants[v].Run();
        times[v].Add(watch.Elapsed.TotalSeconds);
    }
}

double[] medians = [.. times.Select(Median)];
for (int v = 0; v < variants.Length; v++)
{
    Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
        $"{variants[v].Name,-36} median {medians[v]:F3} s  ({rows / medians[v] / 1e6:F2} M rows/s)  runs: {string.Join(" ", times[v].Select(t => t.ToString("F3", CultureInfo.InvariantCulture)))}  ratio to (a): {medians[v] / medians[0]:F3}"));
}

Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"peak working set: {Process.GetCurrentProcess().PeakWorkingSet64 / 1048576.0:F1} MiB"));
return 0;

long Option(string name, long fallback)
{
    int at = Array.IndexOf(args, name);
    return at >= 0 && at + 1 < args.Length ? long.Parse(args[at + 1], CultureInfo.InvariantCulture) : fallback;
}

static double Median(List<double> values)
{
    var sorted = values.Order().ToList();
    int n = sorted.Count;
    return n % 2 == 1 ? sorted[n / 2] : (sorted[(n / 2) - 1] + sorted[n / 2]) / 2;
}
