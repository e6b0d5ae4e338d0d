using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using V = System.Runtime.Intrinsics.Vector256;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// Streaming 'same'-size separable filtering of several float32 fields at once with one
/// symmetric kernel (scipy.ndimage.correlate1d along each axis, half-sample symmetric edges
/// down the columns; the caller pads the rows with its own x edge). Source rows are asked for
/// as the window reaches them and filtered along x into a ring as deep as the kernel, so memory
/// is a few rows per field, whatever the field's size. With a step of 2 only every second row
/// and column is produced (filter, then keep x[::2, ::2]: a pyramid's next level).
/// </summary>
internal sealed class BandFilter
{
    /// <summary>Fills padded[f][0 … columns + 2·radius) with source row <paramref name="row"/> of every field, edges included.</summary>
    public delegate void RowSource(int row, float[][] padded);

    /// <summary>Takes output row <paramref name="row"/> (in output rows) of every field: filtered[f][0 … output columns).</summary>
    public delegate void RowSink(int row, float[][] filtered);

    readonly float[] _kernel;
    readonly int _radius, _taps, _fields, _rows, _columns, _step, _outColumns;
    readonly float[][] _padded, _ring, _out;
    readonly float[] _along;
    readonly int[] _cached, _sources;

    public BandFilter(double[] kernel, int fields, int rows, int columns, int step)
    {
        _kernel = kernel.Select(w => (float)w).ToArray();
        _taps = kernel.Length;
        _radius = _taps / 2;
        _fields = fields;
        _rows = rows;
        _columns = columns;
        _step = step;
        _outColumns = (columns + step - 1) / step;
        _padded = Enumerable.Range(0, fields).Select(_ => new float[columns + 2 * _radius + Vector256<float>.Count]).ToArray();
        _ring = Enumerable.Range(0, fields).Select(_ => new float[_taps * _outColumns]).ToArray();
        _out = Enumerable.Range(0, fields).Select(_ => new float[_outColumns]).ToArray();
        _along = new float[columns];
        _cached = new int[_taps];
        _sources = new int[_taps];
    }

    public int Radius => _radius;
    public int OutputRows => (_rows + _step - 1) / _step;
    public int OutputColumns => _outColumns;

    /// <summary>Filters the fields row band by row band, handing each output row to <paramref name="sink"/> in order.</summary>
    public void Run(RowSource source, RowSink sink)
    {
        Array.Fill(_cached, -1);
        for (int j = 0; j < _rows; j += _step)
        {
            for (int t = 0; t < _taps; t++)
            {
                // the window's rows are one contiguous run (reflection included), shorter than the ring, so row mod taps never collides
                int s = SeparableFilter.EdgeIndex(j + t - _radius, _rows, Edge.Reflect), slot = s % _taps;
                if (_cached[slot] != s)
                {
                    source(s, _padded);
                    for (int f = 0; f < _fields; f++) AlongRow(_padded[f], _ring[f].AsSpan(slot * _outColumns, _outColumns));
                    _cached[slot] = s;
                }
                _sources[t] = slot * _outColumns;
            }
            for (int f = 0; f < _fields; f++) Down(_ring[f], _out[f]);
            sink(j / _step, _out);
        }
    }

    /// <summary>Fills the x edges of a padded row (values at radius … radius + columns − 1) by reflection or wrapping.</summary>
    public static void PadEdges(float[] padded, int columns, int radius, Edge edge)
    {
        for (int p = 0; p < radius; p++)
        {
            padded[p] = padded[radius + SeparableFilter.EdgeIndex(p - radius, columns, edge)];
            padded[radius + columns + p] = padded[radius + SeparableFilter.EdgeIndex(columns + p, columns, edge)];
        }
    }

    void AlongRow(float[] padded, Span<float> target)
    {
        if (_step == 1)
        {
            Along(padded, target);
            return;
        }
        Along(padded, _along);
        for (int i = 0; i < target.Length; i++) target[i] = _along[i * _step];
    }

    /// <summary>target[i] = Σ_k w_k · padded[i + k]; pairs of symmetric taps share one multiply.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    void Along(ReadOnlySpan<float> padded, Span<float> target)
    {
        int n = target.Length, r = _radius, i = 0;
        ref float src = ref MemoryMarshal.GetReference(padded);
        ref float dst = ref MemoryMarshal.GetReference(target);
        ref float w = ref MemoryMarshal.GetArrayDataReference(_kernel);
        if (V.IsHardwareAccelerated)
            for (; i + 8 <= n; i += 8)
            {
                ref float at = ref Unsafe.Add(ref src, i + r);
                var acc = V.LoadUnsafe(ref at) * V.Create(Unsafe.Add(ref w, r));
                for (int k = 1; k <= r; k++)
                    acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref Unsafe.Subtract(ref at, k)) + V.LoadUnsafe(ref Unsafe.Add(ref at, k)), V.Create(Unsafe.Add(ref w, r + k)), acc);
                acc.StoreUnsafe(ref dst, (nuint)i);
            }
        for (; i < n; i++)
        {
            float acc = _kernel[r] * Unsafe.Add(ref src, i + r);
            for (int k = 1; k <= r; k++) acc += _kernel[r + k] * (Unsafe.Add(ref src, i + r - k) + Unsafe.Add(ref src, i + r + k));
            Unsafe.Add(ref dst, i) = acc;
        }
    }

    /// <summary>target[i] = Σ_t w_t · ring[sources[t] + i]: the window's rows weighted and summed, symmetric taps paired.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    void Down(float[] ring, Span<float> target)
    {
        int n = target.Length, r = _radius, i = 0;
        ref float src = ref MemoryMarshal.GetArrayDataReference(ring);
        ref float dst = ref MemoryMarshal.GetReference(target);
        ref float w = ref MemoryMarshal.GetArrayDataReference(_kernel);
        ref int rows = ref MemoryMarshal.GetArrayDataReference(_sources);
        if (V.IsHardwareAccelerated)
            for (; i + 8 <= n; i += 8)
            {
                var acc = V.LoadUnsafe(ref src, (nuint)(Unsafe.Add(ref rows, r) + i)) * V.Create(Unsafe.Add(ref w, r));
                for (int k = 1; k <= r; k++)
                    acc = V.FusedMultiplyAdd(V.LoadUnsafe(ref src, (nuint)(Unsafe.Add(ref rows, r - k) + i)) + V.LoadUnsafe(ref src, (nuint)(Unsafe.Add(ref rows, r + k) + i)),
                        V.Create(Unsafe.Add(ref w, r + k)), acc);
                acc.StoreUnsafe(ref dst, (nuint)i);
            }
        for (; i < n; i++)
        {
            float acc = _kernel[r] * ring[_sources[r] + i];
            for (int k = 1; k <= r; k++) acc += _kernel[r + k] * (ring[_sources[r - k] + i] + ring[_sources[r + k] + i]);
            Unsafe.Add(ref dst, i) = acc;
        }
    }
}
