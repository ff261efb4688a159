namespace ModelWatch.Numerics.Randomness;

/// <summary>
/// Blackman &amp; Vigna's (2021) xoshiro256** generator, seeded through SplitMix64, with standard normals by
/// Marsaglia's polar method. Deterministic on every platform for a given seed, fast, and small enough to give each
/// simulated path its own stream. Not for cryptography.
/// </summary>
public sealed class Xoshiro256
{
    private ulong _s0;
    private ulong _s1;
    private ulong _s2;
    private ulong _s3;
    private double _spare;
    private bool _hasSpare;

    /// <summary>Creates a generator whose stream depends only on <paramref name="seed"/>.</summary>
    public Xoshiro256(ulong seed)
    {
        _s0 = SplitMix(ref seed);
        _s1 = SplitMix(ref seed);
        _s2 = SplitMix(ref seed);
        _s3 = SplitMix(ref seed);
    }

    /// <summary>The next 64 random bits.</summary>
    public ulong NextUInt64()
    {
        ulong result = RotateLeft(_s1 * 5, 7) * 9;
        ulong t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>A uniform double in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>A uniform integer in [0, <paramref name="bound"/>).</summary>
    public int NextInt(int bound)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(bound);

        // Lemire's multiply-shift: the bias is at most bound/2⁶⁴, far below anything a simulation here can see.
        return (int)(((NextUInt64() >> 32) * (ulong)bound) >> 32);
    }

    /// <summary>A standard normal draw (Marsaglia's polar method; the second draw of each pair is kept for the next call).</summary>
    public double NextNormal()
    {
        if (_hasSpare)
        {
            _hasSpare = false;
            return _spare;
        }

        double u;
        double v;
        double r;
        do
        {
            u = (2.0 * NextDouble()) - 1.0;
            v = (2.0 * NextDouble()) - 1.0;
            r = (u * u) + (v * v);
        }
        while (r >= 1.0 || r == 0.0);

        double f = Math.Sqrt(-2.0 * Math.Log(r) / r);
        _spare = v * f;
        _hasSpare = true;
        return u * f;
    }

    /// <summary>The stream seed of substream <paramref name="index"/> of <paramref name="seed"/> (SplitMix64 of the pair).</summary>
    public static ulong Substream(ulong seed, ulong index)
    {
        ulong state = seed ^ (index * 0x9E3779B97F4A7C15UL);
        return SplitMix(ref state);
    }

    private static ulong SplitMix(ref ulong state)
    {
        ulong z = state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    private static ulong RotateLeft(ulong x, int k) => (x << k) | (x >> (64 - k));
}
