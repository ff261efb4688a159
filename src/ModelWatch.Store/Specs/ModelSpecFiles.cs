namespace ModelWatch.Store.Specs;

/// <summary>
/// Loads model specs from a file or from every <c>*.yaml</c>/<c>*.yml</c> file of a folder (one model per file) and
/// validates them all, so that an apply either has every spec valid or reports every problem of every file.
/// </summary>
public static class ModelSpecFiles
{
    /// <summary>Loads and validates; throws <see cref="ModelSpecException"/> listing every problem when any spec is invalid.</summary>
    public static IReadOnlyList<(ModelSpec Spec, string File)> Load(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        string[] files;
        if (Directory.Exists(path))
        {
            files = [.. Directory.EnumerateFiles(path, "*.*", SearchOption.TopDirectoryOnly)
                .Where(f => f.EndsWith(".yaml", StringComparison.OrdinalIgnoreCase) || f.EndsWith(".yml", StringComparison.OrdinalIgnoreCase))
                .Order(StringComparer.Ordinal)];
            if (files.Length == 0)
            {
                throw new ModelSpecException([new SpecProblem(path, string.Empty, "the folder has no *.yaml or *.yml model specs")]);
            }
        }
        else if (File.Exists(path))
        {
            files = [path];
        }
        else
        {
            throw new ModelSpecException([new SpecProblem(path, string.Empty, "no such file or folder")]);
        }

        var problems = new List<SpecProblem>();
        var specs = new List<(ModelSpec Spec, string File)>();
        var fileOfKey = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (string file in files)
        {
            string shown = DisplayPath(file);
            string text;
            try
            {
                text = File.ReadAllText(file);
            }
            catch (IOException ex)
            {
                problems.Add(new SpecProblem(shown, string.Empty, $"cannot be read: {ex.Message}"));
                continue;
            }

            if (ModelSpecValidator.FromYaml(shown, text, problems) is not { } spec)
            {
                continue;
            }

            if (fileOfKey.TryGetValue(spec.Key, out string? other))
            {
                problems.Add(new SpecProblem(shown, "key", $"'{spec.Key}' is also the key of {other}; each model has one file"));
                continue;
            }

            fileOfKey.Add(spec.Key, shown);
            specs.Add((spec, Path.GetFullPath(file)));
        }

        return problems.Count > 0 ? throw new ModelSpecException(problems) : specs;
    }

    /// <summary>How a spec file is named in messages: relative to the current folder when inside it, else in full.</summary>
    public static string DisplayPath(string file)
    {
        string relative = Path.GetRelativePath(Directory.GetCurrentDirectory(), file);
        return relative.StartsWith("..", StringComparison.Ordinal) ? Path.GetFullPath(file) : relative;
    }
}
