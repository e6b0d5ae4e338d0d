using System.Runtime.Intrinsics;
namespace GridDrift.Similarity;

/// <summary>How a filter sees beyond the edge of a row or column.</summary>
public enum Edge
{
    /// <summary>Half-sample symmetric (… c b a | a b c …), scipy.ndimage's 'reflect'.</summary>
    Reflect,
    /// <summary>Periodic: a global grid's longitude circle.</summary>
    Wrap,
}

/// <summary>
/// Separable 'valid' filtering (MATLAB filter2's 'valid': the border where the window leaves
/// the field is dropped) of row-major float64 fields with a symmetric kernel: first along rows
/// (x), then along columns (y), each a register-accumulating SIMD loop. The edge rules
/// (<see cref="EdgeIndex"/>) serve the streaming SSIM filter.
/// </summary>
public sealed class SeparableFilter
{
    readonly double[] _kernel;
    readonly int _radius;
    double[] _rows = [];

    public SeparableFilter(double[] kernel)
    {
        _kernel = kernel;
        _radius = kernel.Length / 2;
    }

    public int Radius => _radius;

    /// <summary>'valid' filtering: output has (rows − 2r) × (columns − 2r) values.</summary>
    public void Valid(ReadOnlySpan<double> field, int rows, int columns, Span<double> output)
    {
        int outRows = rows - 2 * _radius, outColumns = columns - 2 * _radius;
        if (outRows <= 0 || outColumns <= 0) return;
        EnsureScratch(rows, outColumns);
        var horizontal = _rows.AsSpan(0, rows * outColumns);
        for (int j = 0; j < rows; j++)
            Along(field.Slice(j * columns, columns), horizontal.Slice(j * outColumns, outColumns));
        Span<int> sources = stackalloc int[_kernel.Length];
        for (int j = 0; j < outRows; j++)
        {
            for (int k = 0; k < _kernel.Length; k++) sources[k] = (j + k) * outColumns;
            Columns(horizontal, sources, outColumns, output.Slice(j * outColumns, outColumns));
        }
    }

    /// <summary>target[i] = Σ_k w_k · source[i + k] for the symmetric kernel: pairs of taps share one multiply, accumulated in a register.</summary>
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

    void EnsureScratch(int rows, int columns)
    {
        if (_rows.Length < rows * columns) _rows = new double[rows * columns];
    }
}
