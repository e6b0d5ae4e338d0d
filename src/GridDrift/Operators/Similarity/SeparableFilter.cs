using System.Runtime.Intrinsics;
namespace GridDrift.Operators.Similarity;

/// <summary>How a filter sees beyond the edge of a row or column.</summary>
internal enum Edge
{
    /// <summary>Half-sample symmetric (… c b a | a b c …), scipy.ndimage's 'reflect'.</summary>
    Reflect,
    /// <summary>Periodic: a global grid's longitude circle.</summary>
    Wrap,
}

/// <summary>
/// Separable 'valid' filtering (MATLAB filter2's 'valid': the border where the window leaves
/// the field is dropped) of row-major float64 fields with a symmetric kernel: first along rows
/// (x), then along columns (y), each a register-accumulating SIMD loop. The rows filtered along
/// x live in a ring just deep enough for four output rows, which are filtered together so each
/// loaded row serves all four; the working set stays in cache however large the field. The
/// edge rules (<see cref="EdgeIndex"/>) serve the streaming SSIM filter.
/// </summary>
internal sealed class SeparableFilter
{
    const int Block = 4;
    readonly double[] _kernel;
    readonly double[] _padded; // the kernel with Block − 1 zeros on each side: a block's taps without branches
    readonly int _radius, _taps, _slots;
    readonly int[] _cached, _sources;
    double[] _ring = [], _product = [];

    public SeparableFilter(double[] kernel)
    {
        _kernel = kernel;
        _taps = kernel.Length;
        _radius = _taps / 2;
        _slots = _taps + Block - 1;
        _padded = new double[_taps + 2 * (Block - 1)];
        kernel.CopyTo(_padded, Block - 1);
        _cached = new int[_slots];
        _sources = new int[_slots];
    }

    public int Radius => _radius;

    /// <summary>'valid' filtering: output has (rows − 2r) × (columns − 2r) values.</summary>
    public void Valid(ReadOnlySpan<double> field, int rows, int columns, Span<double> output) =>
        Valid(field, default, rows, columns, output);

    /// <summary>
    /// 'valid' filtering of the cell-by-cell product field · factor (when factor is not empty),
    /// formed a row at a time so the product field is never stored.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Valid(ReadOnlySpan<double> field, ReadOnlySpan<double> factor, int rows, int columns, Span<double> output)
    {
        int outRows = rows - 2 * _radius, outColumns = columns - 2 * _radius;
        if (outRows <= 0 || outColumns <= 0) return;
        if (_ring.Length < _slots * outColumns) _ring = new double[_slots * outColumns];
        if (_product.Length < columns) _product = new double[columns];
        Array.Fill(_cached, -1);
        for (int j0 = 0; j0 < outRows; j0 += Block)
        {
            int nb = Math.Min(Block, outRows - j0);
            for (int t = 0; t < nb + _taps - 1; t++)
            {
                int s = j0 + t, slot = s % _slots;
                if (_cached[slot] != s)
                {
                    var row = field.Slice(s * columns, columns);
                    if (!factor.IsEmpty)
                    {
                        System.Numerics.Tensors.TensorPrimitives.Multiply(row, factor.Slice(s * columns, columns), _product.AsSpan(0, columns));
                        row = _product.AsSpan(0, columns);
                    }
                    Along(row, _ring.AsSpan(slot * outColumns, outColumns));
                    _cached[slot] = s;
                }
                _sources[t] = slot * outColumns;
            }
            if (nb == Block) ColumnsBlock(_ring, _sources, outColumns, output.Slice(j0 * outColumns, Block * outColumns));
            else
                for (int b = 0; b < nb; b++)
                    Columns(_ring, _sources.AsSpan(b, _taps), outColumns, output.Slice((j0 + b) * outColumns, outColumns));
        }
    }

    /// <summary>Four output rows at once: row o is Σ_t padded[t − o + 3] · field[sources[t] + i] over the taps + 3 input rows.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    void ColumnsBlock(ReadOnlySpan<double> field, ReadOnlySpan<int> sources, int n, Span<double> target)
    {
        int inputs = _taps + Block - 1, i = 0;
        ref double src = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(field);
        ref double dst = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(target);
        ref double w = ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(_padded);
        if (Vector256.IsHardwareAccelerated)
            for (; i + 4 <= n; i += 4)
            {
                var a0 = Vector256<double>.Zero; var a1 = a0; var a2 = a0; var a3 = a0;
                for (int t = 0; t < inputs; t++)
                {
                    var v = Vector256.LoadUnsafe(ref src, (nuint)(sources[t] + i));
                    a0 = Vector256.FusedMultiplyAdd(v, Vector256.Create(System.Runtime.CompilerServices.Unsafe.Add(ref w, t + 3)), a0);
                    a1 = Vector256.FusedMultiplyAdd(v, Vector256.Create(System.Runtime.CompilerServices.Unsafe.Add(ref w, t + 2)), a1);
                    a2 = Vector256.FusedMultiplyAdd(v, Vector256.Create(System.Runtime.CompilerServices.Unsafe.Add(ref w, t + 1)), a2);
                    a3 = Vector256.FusedMultiplyAdd(v, Vector256.Create(System.Runtime.CompilerServices.Unsafe.Add(ref w, t)), a3);
                }
                a0.StoreUnsafe(ref dst, (nuint)i);
                a1.StoreUnsafe(ref dst, (nuint)(n + i));
                a2.StoreUnsafe(ref dst, (nuint)(2 * n + i));
                a3.StoreUnsafe(ref dst, (nuint)(3 * n + i));
            }
        for (; i < n; i++)
            for (int o = 0; o < Block; o++)
            {
                double acc = 0;
                for (int k = 0; k < _taps; k++) acc += _kernel[k] * System.Runtime.CompilerServices.Unsafe.Add(ref src, sources[o + k] + i);
                System.Runtime.CompilerServices.Unsafe.Add(ref dst, o * n + i) = acc;
            }
    }

    /// <summary>target[i] = Σ_k w_k · source[i + k] for the symmetric kernel: pairs of taps share one multiply, accumulated in a register.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    internal void Along(ReadOnlySpan<double> source, Span<double> target)
    {
        int n = target.Length, r = _radius, i = 0;
        ref double src = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(source);
        ref double dst = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(target);
        if (Vector256.IsHardwareAccelerated)
            for (; i + 4 <= n; i += 4)
            {
                var acc = Vector256.LoadUnsafe(ref src, (nuint)(i + r)) * Vector256.Create(_kernel[r]);
                for (int k = 1; k <= r; k++)
                    acc = Vector256.FusedMultiplyAdd(Vector256.LoadUnsafe(ref src, (nuint)(i + r - k)) + Vector256.LoadUnsafe(ref src, (nuint)(i + r + k)),
                        Vector256.Create(_kernel[r + k]), acc);
                acc.StoreUnsafe(ref dst, (nuint)i);
            }
        for (; i < n; i++)
        {
            double acc = _kernel[r] * System.Runtime.CompilerServices.Unsafe.Add(ref src, i + r);
            for (int k = 1; k <= r; k++)
                acc += _kernel[r + k] * (System.Runtime.CompilerServices.Unsafe.Add(ref src, i + r - k) + System.Runtime.CompilerServices.Unsafe.Add(ref src, i + r + k));
            System.Runtime.CompilerServices.Unsafe.Add(ref dst, i) = acc;
        }
    }

    /// <summary>target[i] = Σ_k w_k · field[sources[k] + i]: a weighted sum of whole rows, pairing the symmetric taps.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    internal void Columns(ReadOnlySpan<double> field, ReadOnlySpan<int> sources, int n, Span<double> target)
    {
        int r = _radius, i = 0;
        ref double src = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(field);
        ref double dst = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(target);
        if (Vector256.IsHardwareAccelerated)
            for (; i + 4 <= n; i += 4)
            {
                var acc = Vector256.LoadUnsafe(ref src, (nuint)(sources[r] + i)) * Vector256.Create(_kernel[r]);
                for (int k = 1; k <= r; k++)
                    acc = Vector256.FusedMultiplyAdd(Vector256.LoadUnsafe(ref src, (nuint)(sources[r - k] + i)) + Vector256.LoadUnsafe(ref src, (nuint)(sources[r + k] + i)),
                        Vector256.Create(_kernel[r + k]), acc);
                acc.StoreUnsafe(ref dst, (nuint)i);
            }
        for (; i < n; i++)
        {
            double acc = _kernel[r] * System.Runtime.CompilerServices.Unsafe.Add(ref src, sources[r] + i);
            for (int k = 1; k <= r; k++)
                acc += _kernel[r + k] * (System.Runtime.CompilerServices.Unsafe.Add(ref src, sources[r - k] + i) + System.Runtime.CompilerServices.Unsafe.Add(ref src, sources[r + k] + i));
            System.Runtime.CompilerServices.Unsafe.Add(ref dst, i) = acc;
        }
    }

    /// <summary>Index of a position beyond the edge: mirrored half-sample symmetrically, or wrapped.</summary>
    public static int EdgeIndex(int i, int n, Edge edge)
    {
        if (edge == Edge.Wrap) return ((i % n) + n) % n;
        if (n == 1) return 0;
        int period = 2 * n;
        i = ((i % period) + period) % period;
        return i < n ? i : period - 1 - i;
    }

}
