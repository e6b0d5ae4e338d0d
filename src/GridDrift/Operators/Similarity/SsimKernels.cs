using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using V = System.Runtime.Intrinsics.Vector256;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// SSIM's filter loops in float32 for its fixed 11-tap window, eight lanes at a time: the six
/// distinct weights of the symmetric window stay in registers and the taps are written out, so
/// the inner loop has neither bounds checks nor a loop over taps. Columns that do not fill a
/// vector fall back to the plain sums.
/// </summary>
static class SsimKernels
{
    public const int Taps = 11, Radius = 5;

    /// <summary>target[i] = Σ_k w_k · source[i + k]; pairs of symmetric taps share one multiply.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static void Along(float[] kernel, ReadOnlySpan<float> source, Span<float> target)
    {
        int n = target.Length, i = 0;
        ref float src = ref MemoryMarshal.GetReference(source);
        ref float dst = ref MemoryMarshal.GetReference(target);
        if (V.IsHardwareAccelerated)
        {
            var w0 = V.Create(kernel[5]);
            var w1 = V.Create(kernel[6]);
            var w2 = V.Create(kernel[7]);
            var w3 = V.Create(kernel[8]);
            var w4 = V.Create(kernel[9]);
            var w5 = V.Create(kernel[10]);
            for (; i + 8 <= n; i += 8)
            {
                ref float row = ref Unsafe.Add(ref src, i);
                var acc = V.LoadUnsafe(ref row, (nuint)5) * w0;
                acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref row, (nuint)4) + V.LoadUnsafe(ref row, (nuint)6), w1, acc);
                acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref row, (nuint)3) + V.LoadUnsafe(ref row, (nuint)7), w2, acc);
                acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref row, (nuint)2) + V.LoadUnsafe(ref row, (nuint)8), w3, acc);
                acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref row, (nuint)1) + V.LoadUnsafe(ref row, (nuint)9), w4, acc);
                acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref row, (nuint)0) + V.LoadUnsafe(ref row, (nuint)10), w5, acc);
                V.StoreUnsafe(acc, ref dst, (nuint)i);
            }
        }
        for (; i < n; i++)
        {
            float acc = kernel[Radius] * Unsafe.Add(ref src, i + Radius);
            for (int k = 1; k <= Radius; k++)
                acc += kernel[Radius + k] * (Unsafe.Add(ref src, i + Radius - k) + Unsafe.Add(ref src, i + Radius + k));
            Unsafe.Add(ref dst, i) = acc;
        }
    }

    /// <summary>
    /// Four output rows at once: target row o (o = 0 … 3) is Σ_k w_k · field[sources[o + k] + i].
    /// Each of the 14 input rows is loaded once per column step and feeds every output it reaches.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static void ColumnsBlock(float[] kernel, ReadOnlySpan<float> field, ReadOnlySpan<int> sources, int n, Span<float> target)
    {
        int i = 0;
        ref float src = ref MemoryMarshal.GetReference(field);
        ref float dst = ref MemoryMarshal.GetReference(target);
        if (V.IsHardwareAccelerated)
        {
            nint s0 = sources[0];
            nint s1 = sources[1];
            nint s2 = sources[2];
            nint s3 = sources[3];
            nint s4 = sources[4];
            nint s5 = sources[5];
            nint s6 = sources[6];
            nint s7 = sources[7];
            nint s8 = sources[8];
            nint s9 = sources[9];
            nint s10 = sources[10];
            nint s11 = sources[11];
            nint s12 = sources[12];
            nint s13 = sources[13];
            var w0 = V.Create(kernel[5]);
            var w1 = V.Create(kernel[6]);
            var w2 = V.Create(kernel[7]);
            var w3 = V.Create(kernel[8]);
            var w4 = V.Create(kernel[9]);
            var w5 = V.Create(kernel[10]);
            for (; i + 8 <= n; i += 8)
            {
                var a0 = System.Runtime.Intrinsics.Vector256<float>.Zero; var a1 = a0; var a2 = a0; var a3 = a0;
                System.Runtime.Intrinsics.Vector256<float> v;
                v = V.LoadUnsafe(ref src, (nuint)(s0 + i));
                a0 = V.FusedMultiplyAdd(v, w5, a0);
                v = V.LoadUnsafe(ref src, (nuint)(s1 + i));
                a0 = V.FusedMultiplyAdd(v, w4, a0);
                a1 = V.FusedMultiplyAdd(v, w5, a1);
                v = V.LoadUnsafe(ref src, (nuint)(s2 + i));
                a0 = V.FusedMultiplyAdd(v, w3, a0);
                a1 = V.FusedMultiplyAdd(v, w4, a1);
                a2 = V.FusedMultiplyAdd(v, w5, a2);
                v = V.LoadUnsafe(ref src, (nuint)(s3 + i));
                a0 = V.FusedMultiplyAdd(v, w2, a0);
                a1 = V.FusedMultiplyAdd(v, w3, a1);
                a2 = V.FusedMultiplyAdd(v, w4, a2);
                a3 = V.FusedMultiplyAdd(v, w5, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s4 + i));
                a0 = V.FusedMultiplyAdd(v, w1, a0);
                a1 = V.FusedMultiplyAdd(v, w2, a1);
                a2 = V.FusedMultiplyAdd(v, w3, a2);
                a3 = V.FusedMultiplyAdd(v, w4, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s5 + i));
                a0 = V.FusedMultiplyAdd(v, w0, a0);
                a1 = V.FusedMultiplyAdd(v, w1, a1);
                a2 = V.FusedMultiplyAdd(v, w2, a2);
                a3 = V.FusedMultiplyAdd(v, w3, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s6 + i));
                a0 = V.FusedMultiplyAdd(v, w1, a0);
                a1 = V.FusedMultiplyAdd(v, w0, a1);
                a2 = V.FusedMultiplyAdd(v, w1, a2);
                a3 = V.FusedMultiplyAdd(v, w2, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s7 + i));
                a0 = V.FusedMultiplyAdd(v, w2, a0);
                a1 = V.FusedMultiplyAdd(v, w1, a1);
                a2 = V.FusedMultiplyAdd(v, w0, a2);
                a3 = V.FusedMultiplyAdd(v, w1, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s8 + i));
                a0 = V.FusedMultiplyAdd(v, w3, a0);
                a1 = V.FusedMultiplyAdd(v, w2, a1);
                a2 = V.FusedMultiplyAdd(v, w1, a2);
                a3 = V.FusedMultiplyAdd(v, w0, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s9 + i));
                a0 = V.FusedMultiplyAdd(v, w4, a0);
                a1 = V.FusedMultiplyAdd(v, w3, a1);
                a2 = V.FusedMultiplyAdd(v, w2, a2);
                a3 = V.FusedMultiplyAdd(v, w1, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s10 + i));
                a0 = V.FusedMultiplyAdd(v, w5, a0);
                a1 = V.FusedMultiplyAdd(v, w4, a1);
                a2 = V.FusedMultiplyAdd(v, w3, a2);
                a3 = V.FusedMultiplyAdd(v, w2, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s11 + i));
                a1 = V.FusedMultiplyAdd(v, w5, a1);
                a2 = V.FusedMultiplyAdd(v, w4, a2);
                a3 = V.FusedMultiplyAdd(v, w3, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s12 + i));
                a2 = V.FusedMultiplyAdd(v, w5, a2);
                a3 = V.FusedMultiplyAdd(v, w4, a3);
                v = V.LoadUnsafe(ref src, (nuint)(s13 + i));
                a3 = V.FusedMultiplyAdd(v, w5, a3);
                V.StoreUnsafe(a0, ref dst, (nuint)i);
                V.StoreUnsafe(a1, ref dst, (nuint)(n + i));
                V.StoreUnsafe(a2, ref dst, (nuint)(2 * n + i));
                V.StoreUnsafe(a3, ref dst, (nuint)(3 * n + i));
            }
        }
        for (; i < n; i++)
            for (int o = 0; o < 4; o++)
            {
                float acc = 0;
                for (int k = 0; k < Taps; k++) acc += kernel[k] * Unsafe.Add(ref src, sources[o + k] + i);
                Unsafe.Add(ref dst, o * n + i) = acc;
            }
    }

    /// <summary>target[i] = Σ_k w_k · field[sources[k] + i], pairing the symmetric taps (the last rows of a frame).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static void Columns(float[] kernel, ReadOnlySpan<float> field, ReadOnlySpan<int> sources, int n, Span<float> target)
    {
        ref float src = ref MemoryMarshal.GetReference(field);
        for (int i = 0; i < n; i++)
        {
            float acc = kernel[Radius] * Unsafe.Add(ref src, sources[Radius] + i);
            for (int k = 1; k <= Radius; k++)
                acc += kernel[Radius + k] * (Unsafe.Add(ref src, sources[Radius - k] + i) + Unsafe.Add(ref src, sources[Radius + k] + i));
            target[i] = acc;
        }
    }
}
