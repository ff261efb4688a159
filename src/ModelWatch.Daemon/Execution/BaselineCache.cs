using Microsoft.Extensions.Options;
using ModelWatch.Daemon.Options;
using ModelWatch.Store.Baselines;

namespace ModelWatch.Daemon.Execution;

/// <summary>
/// The current baseline of each model, kept per version: a baseline never changes once stored (a change is a new
/// version), so its reference document — reservoir samples included — is read and parsed once, not on every run.
/// Kept within <see cref="DaemonOptions.BaselineCacheMegabytes"/>: a daemon watching thousands of models must not hold
/// every reference sample at once, so the least recently used baselines make room and are read again when needed.
/// </summary>
public sealed class BaselineCache
{
    private readonly BaselineRepository _baselines;
    private readonly long _budget;
    private readonly Dictionary<string, Entry> _entries = new(StringComparer.Ordinal);
    private readonly Lock _gate = new();
    private long _bytes;
    private long _clock;

    /// <summary>Creates the cache with the configured budget.</summary>
    public BaselineCache(BaselineRepository baselines, IOptions<DaemonOptions> options)
        : this(baselines, (long)(options ?? throw new ArgumentNullException(nameof(options))).Value.BaselineCacheMegabytes * 1024 * 1024)
    {
    }

    /// <summary>Creates the cache with a budget in bytes.</summary>
    internal BaselineCache(BaselineRepository baselines, long budgetBytes)
    {
        ArgumentNullException.ThrowIfNull(baselines);
        _baselines = baselines;
        _budget = budgetBytes;
    }

    /// <summary>Estimated bytes held now.</summary>
    internal long EstimatedBytes
    {
        get
        {
            lock (_gate)
            {
                return _bytes;
            }
        }
    }

    /// <summary>Models whose baseline is held now.</summary>
    internal int Count
    {
        get
        {
            lock (_gate)
            {
                return _entries.Count;
            }
        }
    }

    /// <summary>The model's baseline at <paramref name="version"/>, from memory when it was read before.</summary>
    public async Task<StoredBaseline?> GetAsync(string modelKey, int version, CancellationToken cancellationToken)
    {
        lock (_gate)
        {
            if (_entries.TryGetValue(modelKey, out Entry? cached) && cached.Baseline.Version == version)
            {
                cached.LastUse = ++_clock;
                return cached.Baseline;
            }
        }

        StoredBaseline? stored = await _baselines.GetAsync(modelKey, version, cancellationToken);
        if (stored is not null)
        {
            Keep(modelKey, stored);
        }

        return stored;
    }

    /// <summary>
    /// Bytes a parsed baseline holds, roughly: its samples twice (as stored, and sorted once for the rank tests), the
    /// stored factor, and a fixed allowance for the rest.
    /// </summary>
    public static long EstimateBytes(StoredBaseline baseline)
    {
        ArgumentNullException.ThrowIfNull(baseline);
        Checks.Summaries.BaselineReference reference = baseline.Reference;
        long samples = reference.ResidualSample.Count + reference.FeatureSamples.Sum(s => (long)s.Length);
        long factor = reference.Factor?.Sum(r => (long)r.Length) ?? 0;
        return (16 * samples) + (8 * factor) + 16_384;
    }

    private void Keep(string modelKey, StoredBaseline stored)
    {
        long size = EstimateBytes(stored);
        long budget = _budget;
        lock (_gate)
        {
            if (_entries.Remove(modelKey, out Entry? replaced))
            {
                _bytes -= replaced.Bytes;
            }

            while (_bytes + size > budget && _entries.Count > 0)
            {
                KeyValuePair<string, Entry> oldest = _entries.MinBy(e => e.Value.LastUse);
                _entries.Remove(oldest.Key);
                _bytes -= oldest.Value.Bytes;
            }

            // One baseline larger than the whole budget is still used for this run, just not kept.
            if (size <= budget)
            {
                _entries[modelKey] = new Entry(stored, size) { LastUse = ++_clock };
                _bytes += size;
            }
        }
    }

    /// <summary>A kept baseline, its estimated size and when it was last used (a counter, not a time).</summary>
    private sealed class Entry(StoredBaseline baseline, long bytes)
    {
        public StoredBaseline Baseline { get; } = baseline;

        public long Bytes { get; } = bytes;

        public long LastUse { get; set; }
    }
}
