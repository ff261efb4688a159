using System.Globalization;
using ModelWatch.Daemon.Benchmarks;

// dotnet run -c Release --project tests/ModelWatch.Daemon.Benchmarks -- [--models 1000] [--rows 48]
int models = Argument("--models", 1000);
int rowsPerWindow = Argument("--rows", 48);
await new DaemonThroughput(models, rowsPerWindow, Console.Out).RunAsync();
return 0;

int Argument(string name, int fallback)
{
    int i = Array.IndexOf(args, name);
    return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
}
