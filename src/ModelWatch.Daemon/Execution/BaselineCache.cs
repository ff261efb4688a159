using System.Collections.Concurrent;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// The current baseline of each model, kept per version: a baseline never changes once stored (a change is a new
/// version), so its reference document — reservoir samples included — is read and parsed once, not on every run.
/// </summary>
public sealed class BaselineCache(BaselineRepository baselines)
{
    private readonly ConcurrentDictionary<string, StoredBaseline> _current = new(StringComparer.Ordinal);

    /// <summary>The model's baseline at <paramref name="version"/>, from memory when it was read before.</summary>
    public async Task<StoredBaseline?> GetAsync(string modelKey, int version, CancellationToken cancellationToken)
    {
        if (_current.TryGetValue(modelKey, out StoredBaseline? cached) && cached.Version == version)
        {
            return cached;
        }

        StoredBaseline? stored = await baselines.GetAsync(modelKey, version, cancellationToken);
        if (stored is not null)
        {
            _current[modelKey] = stored;
        }

        return stored;
    }
}
