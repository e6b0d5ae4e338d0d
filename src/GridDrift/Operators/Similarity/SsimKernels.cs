using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

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

    /// <summary>target[i] = Σ_k w_k · source[i + k]; pairs of symmetric taps share one multiply. Sixteen lanes where the machine has them, then eight.</summary>
    public static void Along(float[] kernel, ReadOnlySpan<float> source, Span<float> target)
    {
        int n = target.Length, i = ShiftedAlong.Handles(Radius) ? ShiftedAlong.Run(kernel, source, target) : 0;
        if (Lanes16.Available) i = Along<Lanes16, Vector512<float>>(kernel, source, target, i);
        if (Lanes8.Available) i = Along<Lanes8, Vector256<float>>(kernel, source, target, i);
        ref float src = ref MemoryMarshal.GetReference(source);
        ref float dst = ref MemoryMarshal.GetReference(target);
        for (; i < n; i++)
        {
            float acc = kernel[Radius] * Unsafe.Add(ref src, i + Radius);
            for (int k = 1; k <= Radius; k++)
                acc += kernel[Radius + k] * (Unsafe.Add(ref src, i + Radius - k) + Unsafe.Add(ref src, i + Radius + k));
            Unsafe.Add(ref dst, i) = acc;
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    static int Along<L, TV>(float[] kernel, ReadOnlySpan<float> source, Span<float> target, int i) where L : IFloatLanes<TV>
    {
        int n = target.Length;
        ref float src = ref MemoryMarshal.GetReference(source);
        ref float dst = ref MemoryMarshal.GetReference(target);
        var w0 = L.Splat(kernel[5]);
        var w1 = L.Splat(kernel[6]);
        var w2 = L.Splat(kernel[7]);
        var w3 = L.Splat(kernel[8]);
        var w4 = L.Splat(kernel[9]);
        var w5 = L.Splat(kernel[10]);
        for (; i + L.Count <= n; i += L.Count)
        {
            ref float row = ref Unsafe.Add(ref src, i);
            var acc = L.Multiply(L.Load(ref row, 5), w0);
            acc = L.MultiplyAdd(L.Add(L.Load(ref row, 4), L.Load(ref row, 6)), w1, acc);
            acc = L.MultiplyAdd(L.Add(L.Load(ref row, 3), L.Load(ref row, 7)), w2, acc);
            acc = L.MultiplyAdd(L.Add(L.Load(ref row, 2), L.Load(ref row, 8)), w3, acc);
            acc = L.MultiplyAdd(L.Add(L.Load(ref row, 1), L.Load(ref row, 9)), w4, acc);
            acc = L.MultiplyAdd(L.Add(L.Load(ref row, 0), L.Load(ref row, 10)), w5, acc);
            L.Store(acc, ref dst, i);
        }
        return i;
    }

    /// <summary>
    /// Four output rows at once: target row o (o = 0 … 3) is Σ_k w_k · field[sources[o + k] + i].
    /// Each of the 14 input rows is loaded once per column step and feeds every output it reaches.
    /// </summary>
    public static void ColumnsBlock(float[] kernel, ReadOnlySpan<float> field, ReadOnlySpan<int> sources, int n, Span<float> target)
    {
        int i = 0;
        if (Lanes16.Available) i = ColumnsBlock<Lanes16, Vector512<float>>(kernel, field, sources, n, target, i);
        if (Lanes8.Available) i = ColumnsBlock<Lanes8, Vector256<float>>(kernel, field, sources, n, target, i);
        ref float src = ref MemoryMarshal.GetReference(field);
        ref float dst = ref MemoryMarshal.GetReference(target);
        for (; i < n; i++)
            for (int o = 0; o < 4; o++)
            {
                float acc = 0;
                for (int k = 0; k < Taps; k++) acc += kernel[k] * Unsafe.Add(ref src, sources[o + k] + i);
                Unsafe.Add(ref dst, o * n + i) = acc;
            }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    static int ColumnsBlock<L, TV>(float[] kernel, ReadOnlySpan<float> field, ReadOnlySpan<int> sources, int n, Span<float> target, int i) where L : IFloatLanes<TV>
    {
        ref float src = ref MemoryMarshal.GetReference(field);
        ref float dst = ref MemoryMarshal.GetReference(target);
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
            var w0 = L.Splat(kernel[5]);
            var w1 = L.Splat(kernel[6]);
            var w2 = L.Splat(kernel[7]);
            var w3 = L.Splat(kernel[8]);
            var w4 = L.Splat(kernel[9]);
            var w5 = L.Splat(kernel[10]);
            for (; i + L.Count <= n; i += L.Count)
            {
                var a0 = L.Zero; var a1 = a0; var a2 = a0; var a3 = a0;
                TV v;
                v = L.Load(ref src, s0 + i);
                a0 = L.MultiplyAdd(v, w5, a0);
                v = L.Load(ref src, s1 + i);
                a0 = L.MultiplyAdd(v, w4, a0);
                a1 = L.MultiplyAdd(v, w5, a1);
                v = L.Load(ref src, s2 + i);
                a0 = L.MultiplyAdd(v, w3, a0);
                a1 = L.MultiplyAdd(v, w4, a1);
                a2 = L.MultiplyAdd(v, w5, a2);
                v = L.Load(ref src, s3 + i);
                a0 = L.MultiplyAdd(v, w2, a0);
                a1 = L.MultiplyAdd(v, w3, a1);
                a2 = L.MultiplyAdd(v, w4, a2);
                a3 = L.MultiplyAdd(v, w5, a3);
                v = L.Load(ref src, s4 + i);
                a0 = L.MultiplyAdd(v, w1, a0);
                a1 = L.MultiplyAdd(v, w2, a1);
                a2 = L.MultiplyAdd(v, w3, a2);
                a3 = L.MultiplyAdd(v, w4, a3);
                v = L.Load(ref src, s5 + i);
                a0 = L.MultiplyAdd(v, w0, a0);
                a1 = L.MultiplyAdd(v, w1, a1);
                a2 = L.MultiplyAdd(v, w2, a2);
                a3 = L.MultiplyAdd(v, w3, a3);
                v = L.Load(ref src, s6 + i);
                a0 = L.MultiplyAdd(v, w1, a0);
                a1 = L.MultiplyAdd(v, w0, a1);
                a2 = L.MultiplyAdd(v, w1, a2);
                a3 = L.MultiplyAdd(v, w2, a3);
                v = L.Load(ref src, s7 + i);
                a0 = L.MultiplyAdd(v, w2, a0);
                a1 = L.MultiplyAdd(v, w1, a1);
                a2 = L.MultiplyAdd(v, w0, a2);
                a3 = L.MultiplyAdd(v, w1, a3);
                v = L.Load(ref src, s8 + i);
                a0 = L.MultiplyAdd(v, w3, a0);
                a1 = L.MultiplyAdd(v, w2, a1);
                a2 = L.MultiplyAdd(v, w1, a2);
                a3 = L.MultiplyAdd(v, w0, a3);
                v = L.Load(ref src, s9 + i);
                a0 = L.MultiplyAdd(v, w4, a0);
                a1 = L.MultiplyAdd(v, w3, a1);
                a2 = L.MultiplyAdd(v, w2, a2);
                a3 = L.MultiplyAdd(v, w1, a3);
                v = L.Load(ref src, s10 + i);
                a0 = L.MultiplyAdd(v, w5, a0);
                a1 = L.MultiplyAdd(v, w4, a1);
                a2 = L.MultiplyAdd(v, w3, a2);
                a3 = L.MultiplyAdd(v, w2, a3);
                v = L.Load(ref src, s11 + i);
                a1 = L.MultiplyAdd(v, w5, a1);
                a2 = L.MultiplyAdd(v, w4, a2);
                a3 = L.MultiplyAdd(v, w3, a3);
                v = L.Load(ref src, s12 + i);
                a2 = L.MultiplyAdd(v, w5, a2);
                a3 = L.MultiplyAdd(v, w4, a3);
                v = L.Load(ref src, s13 + i);
                a3 = L.MultiplyAdd(v, w5, a3);
                L.Store(a0, ref dst, i);
                L.Store(a1, ref dst, n + i);
                L.Store(a2, ref dst, 2 * n + i);
                L.Store(a3, ref dst, 3 * n + i);
            }
        }
        return i;
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
