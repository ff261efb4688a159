using ModelWatch.Checks.Findings;
using ModelWatch.Daemon.Execution;
using ModelWatch.Store.Specs;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// Validates the <c>checks:</c> section of specs before anything is written: check names against the checks,
/// setting names and values against the thresholds the daemon will build from them.
/// </summary>
internal static class CheckSettingsValidation
{
    /// <summary>Per-check hook for <see cref="ModelSpecFiles.Load"/>: unknown checks and unknown settings.</summary>
    public static IEnumerable<string> Names(string check, IReadOnlyDictionary<string, string> settings)
    {
        if (!CheckNames.All.Contains(check))
        {
            yield return $"unknown check (known: {string.Join(", ", CheckNames.All)})";
            yield break;
        }

        foreach (string setting in settings.Keys.Where(s => !SpecThresholds.Names.Contains(s)))
        {
            yield return $"unknown setting '{setting}' (known: {string.Join(", ", SpecThresholds.Names.Order(StringComparer.Ordinal))})";
        }
    }

    /// <summary>Loads specs with the hook above, then builds each spec's thresholds so a value that does not parse is refused too.</summary>
    public static IReadOnlyList<(ModelSpec Spec, string File)> Load(string path)
    {
        IReadOnlyList<(ModelSpec Spec, string File)> specs = ModelSpecFiles.Load(path, Names);
        var problems = new List<SpecProblem>();
        foreach ((ModelSpec spec, string file) in specs)
        {
            try
            {
                SpecThresholds.For(spec, TimeProvider.System.GetUtcNow());
            }
            catch (ArgumentException ex)
            {
                problems.Add(new SpecProblem(ModelSpecFiles.DisplayPath(file), "checks", ex.Message));
            }
        }

        return problems.Count > 0 ? throw new ModelSpecException(problems) : specs;
    }
}
