using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace ModelWatch.Numerics.LinearAlgebra;

/// <summary>
/// Dot products and scaled additions over contiguous spans, vectorised with <see cref="Vector{T}"/>.
/// The streaming factor spends almost all of its time here, so these avoid bounds checks and allocation.
/// </summary>
internal static class VectorKernels
{
    /// <summary>Returns the dot product of two spans of equal length.</summary>
    public static double Dot(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        int n = x.Length;
        ref double xr = ref MemoryMarshal.GetReference(x);
        ref double yr = ref MemoryMarshal.GetReference(y);
        int i = 0;
        double sum = 0.0;
        if (Vector.IsHardwareAccelerated && n >= 2 * Vector<double>.Count)
        {
            int w = Vector<double>.Count;
            var acc0 = Vector<double>.Zero;
            var acc1 = Vector<double>.Zero;
            for (; i <= n - (2 * w); i += 2 * w)
            {
                acc0 += Vector.LoadUnsafe(ref xr, (nuint)i) * Vector.LoadUnsafe(ref yr, (nuint)i);
                acc1 += Vector.LoadUnsafe(ref xr, (nuint)(i + w)) * Vector.LoadUnsafe(ref yr, (nuint)(i + w));
            }

            sum = Vector.Sum(acc0 + acc1);
        }

        for (; i < n; i++)
        {
            sum += Unsafe.Add(ref xr, i) * Unsafe.Add(ref yr, i);
        }

        return sum;
    }

    /// <summary>Computes <c>y ← y − a·x</c> in place.</summary>
    public static void SubtractScaled(Span<double> y, double a, ReadOnlySpan<double> x)
    {
        int n = y.Length;
        ref double xr = ref MemoryMarshal.GetReference(x);
        ref double yr = ref MemoryMarshal.GetReference(y);
        int i = 0;
        if (Vector.IsHardwareAccelerated && n >= Vector<double>.Count)
        {
            int w = Vector<double>.Count;
            var va = new Vector<double>(a);
            for (; i <= n - w; i += w)
            {
                var yv = Vector.LoadUnsafe(ref yr, (nuint)i) - (va * Vector.LoadUnsafe(ref xr, (nuint)i));
                yv.StoreUnsafe(ref yr, (nuint)i);
            }
        }

        for (; i < n; i++)
        {
            Unsafe.Add(ref yr, i) -= a * Unsafe.Add(ref xr, i);
        }
    }
}
