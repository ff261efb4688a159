using ModelWatch.Checks.Policy;

namespace ModelWatch.Checks.Evaluation;

/// <summary>
/// Reads a spec's <c>checks:</c> section: every key must be a registered check, every setting one of that check's own
/// (<see cref="IModelCheck.Settings"/>) or a model-wide one (<see cref="PolicySettings"/>, which may be written under
/// any check), and every value must parse and lie in range. <c>model apply</c>, <c>model validate</c>, the daemon's
/// spec-folder sync and the run all read settings through here, so they accept and refuse the same specs.
/// </summary>
public static class CheckSettingsReader
{
    /// <summary>Every problem with one check's section, as "message" texts (empty when it is valid).</summary>
    public static IEnumerable<string> Problems(string check, IReadOnlyDictionary<string, string> settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        IModelCheck? owner = CheckRegistry.Find(check);
        if (owner is null)
        {
            yield return $"unknown check '{check}' (checks: {string.Join(", ", CheckRegistry.Names)})";
            yield break;
        }

        foreach ((string name, string text) in settings)
        {
            if (Find(owner, name) is not { } setting)
            {
                IModelCheck? elsewhere = CheckRegistry.All.FirstOrDefault(c => c.Settings.Any(s => s.Name == name));
                yield return elsewhere is not null
                    ? $"'{name}' is a setting of the {elsewhere.Name} check; write it under checks.{elsewhere.Name}"
                    : $"unknown setting '{name}' (settings of {check}: {string.Join(", ", owner.Settings.Select(s => s.Name))}; model-wide: {string.Join(", ", PolicySettings.All.Select(s => s.Name))})";
                continue;
            }

            if (!setting.TryParse(text, out _, out string error))
            {
                yield return $"{name}: {error}";
            }
        }
    }

    /// <summary>
    /// The settings of a model from its spec's sections and schedule; throws <see cref="ArgumentException"/> with every
    /// problem when a section is invalid.
    /// </summary>
    public static CheckThresholds Read(
        IReadOnlyDictionary<string, IReadOnlyDictionary<string, string>> sections,
        TimeSpan cadence,
        TimeSpan window,
        int? minimumRows,
        string model)
    {
        ArgumentNullException.ThrowIfNull(sections);
        var problems = sections.SelectMany(kv => Problems(kv.Key, kv.Value).Select(p => $"checks.{kv.Key}: {p}")).ToList();
        if (problems.Count > 0)
        {
            throw new ArgumentException($"model {model}: " + string.Join("; ", problems));
        }

        var thresholds = new CheckThresholds { Cadence = cadence, WindowLength = window, MinimumRows = minimumRows };
        var overrides = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach ((string check, IReadOnlyDictionary<string, string> settings) in sections.OrderBy(kv => kv.Key, StringComparer.Ordinal))
        {
            IModelCheck owner = CheckRegistry.Find(check)!;
            foreach ((string name, string text) in settings)
            {
                CheckSetting setting = Find(owner, name)!;
                if (!setting.TryParse(text, out double value, out string error))
                {
                    throw new ArgumentException($"model {model}: checks.{check}.{name}: {error}");
                }

                if (setting.Check is null)
                {
                    thresholds = PolicySettings.Apply(thresholds, setting, value);
                }
                else
                {
                    overrides[setting.Key] = value;
                }
            }
        }

        return thresholds with { Settings = overrides };
    }

    private static CheckSetting? Find(IModelCheck owner, string name) =>
        owner.Settings.FirstOrDefault(s => s.Name == name) ?? PolicySettings.All.FirstOrDefault(s => s.Name == name);
}
