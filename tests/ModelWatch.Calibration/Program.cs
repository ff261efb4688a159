using System.Diagnostics;
using System.Globalization;
using ModelWatch.Calibration;

// dotnet run -c Release --project tests/ModelWatch.Calibration -- [--model-years 20] [--trials 100] [--rows-per-hour 60] [--ratios 1,7,24] [--warmup-runs N]
// dotnet run -c Release --project tests/ModelWatch.Calibration -- --constants     (the budget's derived constants, for docs/checks.md)
if (args.Contains("--constants"))
{
    BudgetConstants.Write(Console.Out);
    return;
}

var options = args.Select((a, i) => (a, i)).Where(x => x.a.StartsWith("--", StringComparison.Ordinal))
    .ToDictionary(x => x.a[2..], x => x.i + 1 < args.Length ? args[x.i + 1] : "", StringComparer.Ordinal);
int Option(string name, int fallback) => options.TryGetValue(name, out string? v) ? int.Parse(v, CultureInfo.InvariantCulture) : fallback;
int modelYears = Option("model-years", 20);
int trials = Option("trials", 100);
var setup = new CalibrationSetup(RowsPerHour: Option("rows-per-hour", 60));
int? warmup = options.ContainsKey("warmup-runs") ? Option("warmup-runs", 0) : null;
int[] ratios = options.TryGetValue("ratios", out string? r) ? [.. r.Split(',').Select(x => int.Parse(x, CultureInfo.InvariantCulture))] : [1, 7, 24];
var cadences = Cadence.All.Where(c => ratios.Contains(c.Ratio)).ToList();
var clock = Stopwatch.StartNew();

Console.WriteLine($"Calibration: {setup.Features} features, σ = 1, {setup.RowsPerHour} rows an hour, baseline of {setup.BaselineDays} days ({setup.BaselineDays * 24 * setup.RowsPerHour:N0} rows), default settings.");
Console.WriteLine();
Console.WriteLine("False critical alerts, no change (budget: 1 per model-year):");
Console.WriteLine();
Console.WriteLine(FalseAlarmResult.Header);
foreach (Cadence cadence in cadences)
{
    Console.WriteLine(FalseAlarmSimulation.Run(setup, cadence, modelYears).Row());
}

Console.WriteLine();
Console.WriteLine($"Detection delay in runs after the change, {trials} trials each (cap 30 runs):");
Console.WriteLine();
Console.WriteLine(DetectionResult.Header);
foreach (Cadence cadence in cadences)
{
    foreach (Scenario scenario in Scenario.All)
    {
        Console.WriteLine(DetectionSimulation.Run(setup, cadence, scenario, trials, warmupRuns: warmup).Row(cadence.Every));
    }
}

Console.WriteLine();
Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"Finished in {clock.Elapsed.TotalMinutes:F1} min on {Environment.ProcessorCount} cores."));
