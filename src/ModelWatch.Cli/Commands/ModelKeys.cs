using ModelWatch.Store.Configuration;
using ModelWatch.Store.Models;

namespace ModelWatch.Cli.Commands;

/// <summary>
/// The one way a command looks up the model key it was given: the registered model, or a
/// <see cref="ModelNotFoundException"/> (exit code 3, "no model 'x'; did you mean 'y'?") that names the closest
/// registered key when one is within a typo's distance.
/// </summary>
internal static class ModelKeys
{
    /// <summary>The registered model <paramref name="key"/>, or <see cref="ModelNotFoundException"/>.</summary>
    public static Task<ModelRecord> RequireAsync(StoreDataSources databases, string key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(databases);
        return RequireAsync(new ModelRepository(databases.State, TimeProvider.System, StoreCommandRunner.CommandTimeout), key, cancellationToken);
    }

    /// <summary>The registered model <paramref name="key"/>, or <see cref="ModelNotFoundException"/>.</summary>
    public static async Task<ModelRecord> RequireAsync(ModelRepository models, string key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(models);
        ArgumentNullException.ThrowIfNull(key);
        if (await models.GetAsync(key, cancellationToken) is { } model)
        {
            return model;
        }

        IReadOnlyList<ModelRecord> registered = await models.ListAsync(cancellationToken);
        throw new ModelNotFoundException(key, Closest(key, registered.Select(m => m.Key)));
    }

    /// <summary>
    /// The candidate nearest to <paramref name="key"/> by edit distance (Levenshtein 1966, ignoring case), when it is
    /// at most a third of the key's length away (at least 1, at most 3), or contains the key or is contained in it.
    /// </summary>
    public static string? Closest(string key, IEnumerable<string> candidates)
    {
        ArgumentNullException.ThrowIfNull(key);
        ArgumentNullException.ThrowIfNull(candidates);
        int allowed = Math.Clamp(key.Length / 3, 1, 3);
        return candidates
            .Select(c => (Key: c, Distance: Distance(key.ToLowerInvariant(), c.ToLowerInvariant())))
            .Where(c => c.Distance <= allowed || (key.Length >= 3 && (c.Key.Contains(key, StringComparison.OrdinalIgnoreCase) || key.Contains(c.Key, StringComparison.OrdinalIgnoreCase))))
            .OrderBy(c => c.Distance)
            .ThenBy(c => c.Key, StringComparer.Ordinal)
            .Select(c => c.Key)
            .FirstOrDefault();
    }

    /// <summary>Insertions, deletions and substitutions that turn <paramref name="a"/> into <paramref name="b"/>.</summary>
    public static int Distance(string a, string b)
    {
        ArgumentNullException.ThrowIfNull(a);
        ArgumentNullException.ThrowIfNull(b);
        int[] previous = [.. Enumerable.Range(0, b.Length + 1)];
        int[] current = new int[b.Length + 1];
        for (int i = 1; i <= a.Length; i++)
        {
            current[0] = i;
            for (int j = 1; j <= b.Length; j++)
            {
                int substitution = previous[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
                current[j] = Math.Min(substitution, Math.Min(previous[j], current[j - 1]) + 1);
            }

            (previous, current) = (current, previous);
        }

        return previous[b.Length];
    }
}
