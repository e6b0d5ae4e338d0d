using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using GridDrift.Regions;

namespace GridDrift.Operators.Statistics;

/// <summary>
/// <see cref="WeightedQuantile"/>'s area-weighted quantiles of every box of a
/// <see cref="SeparablePlan"/>, read straight off the frame: no region's cells are copied out.
/// Each frame's cells are given a histogram bin once (4,096 bins over the frame's range; a
/// monotone map, so equal values share a bin and order is kept). Each box then adds its cells'
/// weights R²·Δsinφ_j·Δλ_i into the bins between its own extremes' bins, row by row, finds for
/// every probability the bins that hold the bracketing values, and collects and sorts only the
/// cells of those bins. The weight of the bins below is exact, so the result is a full sort's.
/// One instance per worker; nothing is allocated per frame once the picked buffers have grown.
/// </summary>
internal sealed class BoxQuantiles
{
    const int Bins = 4096;
    // missing cells fall in a bin of their own past the last, which no box reads: the histogram loop needs no test
    const ushort Missing = Bins;
    readonly SeparablePlan _plan;
    readonly ushort[] _bin;
    // two histograms, filled by alternate cells: runs of cells in one bin (smooth fields) then do not wait on each other's stores
    readonly double[] _even = new double[Bins + 1], _odd = new double[Bins + 1], _binWeight = new double[Bins];
    float _lo;
    double _scale;
    float[][] _pickedValues = [];
    double[][] _pickedWeights = [];

    public BoxQuantiles(SeparablePlan plan)
    {
        _plan = plan;
        _bin = new ushort[plan.Rows * plan.Columns];
    }

    /// <summary>Gives every cell of the frame its bin (missing cells the bin past the last).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Bin(ReadOnlySpan<float> frame)
    {
        float lo = float.PositiveInfinity, hi = float.NegativeInfinity;
        int i = 0, n = frame.Length;
        ref float x = ref MemoryMarshal.GetReference(frame);
        if (Vector256.IsHardwareAccelerated)
        {
            var vlo = Vector256.Create(float.PositiveInfinity);
            var vhi = Vector256.Create(float.NegativeInfinity);
            for (; i + 8 <= n; i += 8)
            {
                var v = Vector256.LoadUnsafe(ref x, (nuint)i);
                var valid = Vector256.Equals(v, v);
                vlo = Vector256.Min(vlo, Vector256.ConditionalSelect(valid, v, Vector256.Create(float.PositiveInfinity)));
                vhi = Vector256.Max(vhi, Vector256.ConditionalSelect(valid, v, Vector256.Create(float.NegativeInfinity)));
            }
            for (int lane = 0; lane < 8; lane++) { lo = Math.Min(lo, vlo[lane]); hi = Math.Max(hi, vhi[lane]); }
        }
        for (; i < n; i++)
        {
            float v = Unsafe.Add(ref x, i);
            if (!float.IsNaN(v)) { lo = Math.Min(lo, v); hi = Math.Max(hi, v); }
        }
        _lo = lo;
        _scale = hi > lo ? (Bins - 1) / ((double)hi - lo) : 0;
        // float32 arithmetic is monotone too: x ≤ y gives bin(x) ≤ bin(y)
        float scale = (float)_scale;
        ref ushort bin = ref MemoryMarshal.GetArrayDataReference(_bin);
        i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var vlo = Vector256.Create(lo);
            var vscale = Vector256.Create(scale);
            var top = Vector256.Create(Bins - 1);
            var missing = Vector256.Create((int)Missing);
            for (; i + 16 <= n; i += 16)
            {
                var a = Vector256.LoadUnsafe(ref x, (nuint)i);
                var b = Vector256.LoadUnsafe(ref x, (nuint)(i + 8));
                var ka = Vector256.Min(Vector256.ConvertToInt32((a - vlo) * vscale), top);
                var kb = Vector256.Min(Vector256.ConvertToInt32((b - vlo) * vscale), top);
                ka = Vector256.ConditionalSelect(Vector256.Equals(a, a).AsInt32(), ka, missing);
                kb = Vector256.ConditionalSelect(Vector256.Equals(b, b).AsInt32(), kb, missing);
                Vector256.Narrow(ka.AsUInt32(), kb.AsUInt32()).StoreUnsafe(ref bin, (nuint)i);
            }
        }
        for (; i < n; i++)
        {
            float v = Unsafe.Add(ref x, i);
            Unsafe.Add(ref bin, i) = float.IsNaN(v) ? Missing : (ushort)Math.Min(Bins - 1, (int)((v - lo) * scale));
        }
    }

    int BinOf(double value) => Math.Min(Bins - 1, (int)(((float)value - _lo) * (float)_scale));

    /// <summary>
    /// The quantiles of box <paramref name="box"/> of the frame last given to <see cref="Bin"/>,
    /// whose valid cells lie between <paramref name="min"/> and <paramref name="max"/> (NaN: none).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Evaluate(int box, ReadOnlySpan<float> frame, double min, double max, ReadOnlySpan<double> probabilities, Span<double> results)
    {
        int nq = probabilities.Length;
        if (double.IsNaN(min))
        {
            results[..nq].Fill(double.NaN);
            return;
        }
        var b = _plan.Boxes[box];
        var range = _plan.Ranges[b.Range];
        int columns = _plan.Columns, lowBin = BinOf(min), bins = BinOf(max) - lowBin + 1;
        double r2 = _plan.RadiusSquared;
        _even.AsSpan(lowBin, bins).Clear();
        _odd.AsSpan(lowBin, bins).Clear();
        ref double even = ref MemoryMarshal.GetArrayDataReference(_even);
        ref double odd = ref MemoryMarshal.GetArrayDataReference(_odd);
        ref double width = ref MemoryMarshal.GetArrayDataReference(range.Width);
        for (int t = 0; t < b.RowFactor.Length; t++)
        {
            double f = r2 * b.RowFactor[t];
            if (f <= 0) continue;
            ref ushort row = ref _bin[(b.FirstRow + t) * columns + range.First];
            int i = 0, count = range.Count;
            // a width of 0 (a box across the grid's seam) adds nothing to any bin
            for (; i + 2 <= count; i += 2)
            {
                Unsafe.Add(ref even, Unsafe.Add(ref row, i)) += f * Unsafe.Add(ref width, i);
                Unsafe.Add(ref odd, Unsafe.Add(ref row, i + 1)) += f * Unsafe.Add(ref width, i + 1);
            }
            if (i < count) Unsafe.Add(ref even, Unsafe.Add(ref row, i)) += f * Unsafe.Add(ref width, i);
        }
        var weight = _binWeight.AsSpan(lowBin, bins);
        double total = 0;
        for (int k = 0; k < bins; k++) total += weight[k] = _even[lowBin + k] + _odd[lowBin + k];

        Span<int> first = stackalloc int[nq];
        Span<int> last = stackalloc int[nq];
        Span<double> below = stackalloc double[nq];
        WeightedQuantile.Brackets(weight, total, probabilities, first, last, below);
        Pick(b, range, frame, lowBin, first, last);
        for (int q = 0; q < nq; q++)
        {
            bool lowest = !weight[..first[q]].ContainsAnyExcept(0.0), highest = !weight[(last[q] + 1)..].ContainsAnyExcept(0.0);
            results[q] = WeightedQuantile.FromPicked(_pickedValues[q].AsSpan(0, _picked[q]), _pickedWeights[q].AsSpan(0, _picked[q]), below[q], total, probabilities[q], lowest, highest);
        }
    }

    int[] _picked = [];

    /// <summary>Copies the values and weights of the box's cells in bins [first[q], last[q]] (relative to <paramref name="lowBin"/>) into probability q's buffers.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    void Pick(SeparablePlan.Box b, SeparablePlan.LonRange range, ReadOnlySpan<float> frame, int lowBin, ReadOnlySpan<int> first, ReadOnlySpan<int> last)
    {
        int nq = first.Length, columns = _plan.Columns;
        if (_picked.Length < nq)
        {
            _picked = new int[nq];
            _pickedValues = Enumerable.Range(0, nq).Select(_ => new float[1024]).ToArray();
            _pickedWeights = Enumerable.Range(0, nq).Select(_ => new double[1024]).ToArray();
        }
        _picked.AsSpan().Clear();
        Span<ushort> from = stackalloc ushort[nq];
        Span<ushort> span = stackalloc ushort[nq];
        Span<Vector256<ushort>> vfrom = stackalloc Vector256<ushort>[nq];
        Span<Vector256<ushort>> vspan = stackalloc Vector256<ushort>[nq];
        for (int q = 0; q < nq; q++)
        {
            from[q] = (ushort)(first[q] + lowBin);
            span[q] = (ushort)(last[q] - first[q]);
            vfrom[q] = Vector256.Create(from[q]);
            vspan[q] = Vector256.Create(span[q]);
        }
        double r2 = _plan.RadiusSquared;
        for (int t = 0; t < b.RowFactor.Length; t++)
        {
            double f = r2 * b.RowFactor[t];
            if (f <= 0) continue;
            int at = (b.FirstRow + t) * columns + range.First, count = range.Count, i = 0;
            ref ushort row = ref _bin[at];
            if (Vector256.IsHardwareAccelerated)
                for (; i + 16 <= count; i += 16)
                {
                    // sixteen cells at a time: (bin − from) ≤ span, unsigned, for any probability (missing cells never are)
                    var k = Vector256.LoadUnsafe(ref row, (nuint)i);
                    var any = Vector256<ushort>.Zero;
                    for (int q = 0; q < nq; q++) any |= Vector256.LessThanOrEqual(k - vfrom[q], vspan[q]);
                    if (any == Vector256<ushort>.Zero) continue;
                    for (int c = i; c < i + 16; c++) PickCell(Unsafe.Add(ref row, c), frame[at + c], f * range.Width[c], from, span);
                }
            for (; i < count; i++) PickCell(Unsafe.Add(ref row, i), frame[at + i], f * range.Width[i], from, span);
        }
    }

    void PickCell(ushort k, float value, double w, ReadOnlySpan<ushort> from, ReadOnlySpan<ushort> span)
    {
        if (w <= 0) return;
        for (int q = 0; q < from.Length; q++)
        {
            if ((ushort)(k - from[q]) > span[q]) continue;
            int n = _picked[q];
            if (n == _pickedValues[q].Length)
            {
                Array.Resize(ref _pickedValues[q], 2 * n);
                Array.Resize(ref _pickedWeights[q], 2 * n);
            }
            _pickedValues[q][n] = value;
            _pickedWeights[q][n] = w;
            _picked[q] = n + 1;
        }
    }
}
