using System.Runtime.Intrinsics;
using GridDrift.Frames;

namespace GridDrift.Operators.Climatology;

/// <summary>
/// Count, mean and sum of squared deviations (M2) per slot and cell, in float64: the running
/// update of Welford (1962, Technometrics 4(3): 419) for each new value, and the pairwise
/// combination of Chan, Golub &amp; LeVeque (1979; The American Statistician 37(3): 242, 1983)
/// to merge two partial states of disjoint samples (and a batch of frames into the state). Partial states of disjoint periods (or of
/// shards of one record) therefore merge into the state of them all.
/// Layout: slot-major, slot s of cell c at s × Cells + c.
/// </summary>
internal sealed class MomentState : IClimatologySlots, IDisposable
{
    readonly LargeBuffer<double> _count, _mean, _m2;

    public int Slots { get; }
    public int Cells { get; }
    public Span<double> Count => _count.Span;
    public Span<double> Mean => _mean.Span;
    public Span<double> M2 => _m2.Span;

    public MomentState(int slots, int cells)
    {
        Slots = slots;
        Cells = cells;
        long n = (long)slots * cells;
        if (n > Array.MaxLength) throw new ArgumentOutOfRangeException(nameof(cells), $"{slots} slots × {cells} cells is too many for one state");
        _count = new LargeBuffer<double>(n);
        _mean = new LargeBuffer<double>(n);
        _m2 = new LargeBuffer<double>(n);
    }

    public void Dispose()
    {
        _count.Dispose();
        _mean.Dispose();
        _m2.Dispose();
    }

    /// <summary>Adds a frame's values for cells [start, start + values.Length) to one slot; NaN values are skipped.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Add(int slot, int start, ReadOnlySpan<float> values)
    {
        int offset = slot * Cells + start, n = values.Length, i = 0;
        var count = Count.Slice(offset, n); var mean = Mean.Slice(offset, n); var m2 = M2.Slice(offset, n);
        if (Vector256.IsHardwareAccelerated)
        {
            var one = Vector256.Create(1.0);
            for (; i + 8 <= n; i += 8)
            {
                var (lo, hi) = Vector256.Widen(Vector256.Create(values.Slice(i, 8)));
                Update(lo, count.Slice(i, 4), mean.Slice(i, 4), m2.Slice(i, 4), one);
                Update(hi, count.Slice(i + 4, 4), mean.Slice(i + 4, 4), m2.Slice(i + 4, 4), one);
            }
        }
        for (; i < n; i++)
        {
            double x = values[i];
            if (double.IsNaN(x)) continue;
            double k = count[i] + 1, delta = x - mean[i];
            mean[i] += delta / k;
            m2[i] += delta * (x - mean[i]);
            count[i] = k;
        }
    }

    /// <summary>
    /// Adds several frames to one slot for cells [start, start + length): member m's values start
    /// at address <paramref name="frames"/>[m] (cell 0), stored as <typeparamref name="TValues"/>
    /// decodes them (a decoded buffer, or a mapped file's pages). The frames' own count, mean
    /// and M2 come from one pass of sums of d and d² with d = x − K, shifted by K = the state's
    /// running mean (or the first frame's value where the state is empty), so the sums stay small
    /// and keep their digits (the shifted-data algorithm; Chan, Golub &amp; LeVeque 1983, §3); they
    /// are then merged into the state by the Chan et al. update. One division per cell per call
    /// instead of one per frame, and the state read and written once per call: a diurnal
    /// climatology's state is far larger than the caches, and its slots recur only daily.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public unsafe void AddFrames<TValues>(int slot, int start, int length, ReadOnlySpan<nint> frames, TValues values) where TValues : struct, IStoredFloats
    {
        const int BlockCells = 1024; // the four sums of a block stay in the first-level cache
        double* bn = stackalloc double[BlockCells], s1 = stackalloc double[BlockCells], s2 = stackalloc double[BlockCells], shift = stackalloc double[BlockCells];
        for (int block = 0; block < length; block += BlockCells)
        {
            int n = Math.Min(BlockCells, length - block), from = start + block;
            int at = slot * Cells + from;
            new Span<double>(bn, n).Clear(); new Span<double>(s1, n).Clear(); new Span<double>(s2, n).Clear();
            byte* first = (byte*)frames[0] + 4L * from;
            var stateCount = Count.Slice(at, n); var stateMean = Mean.Slice(at, n);
            for (int i = 0; i < n; i++)
            {
                double x = values.Load(first + 4 * i);
                shift[i] = stateCount[i] > 0 ? stateMean[i] : double.IsNaN(x) ? 0 : x;
            }
            int m = 0;
            for (; m + 4 <= frames.Length; m += 4)
                SumShifted4((byte*)frames[m] + 4L * from, (byte*)frames[m + 1] + 4L * from, (byte*)frames[m + 2] + 4L * from, (byte*)frames[m + 3] + 4L * from,
                    n, values, shift, bn, s1, s2);
            for (; m < frames.Length; m++) SumShifted((byte*)frames[m] + 4L * from, n, values, shift, bn, s1, s2);
            var cn = new Span<double>(bn, n); var c1 = new Span<double>(s1, n); var c2 = new Span<double>(s2, n);
            BatchMoments(cn, new ReadOnlySpan<double>(shift, n), c1, c2);
            MergeBatch(Count.Slice(at, n), Mean.Slice(at, n), M2.Slice(at, n), cn, c1, c2);
        }
    }

    /// <summary>count += valid; s1 += d; s2 += d² with d = x − shift over n values at <paramref name="x"/>, NaN values left out.</summary>
    static unsafe void SumShifted<TValues>(byte* x, int n, TValues values, double* shift, double* count, double* s1, double* s2) where TValues : struct, IStoredFloats
    {
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var one = Vector256.Create(1.0);
            for (; i + 4 <= n; i += 4)
            {
                var v = values.Load4(x + 4 * i);
                var valid = Vector256.Equals(v, v);
                var d = (v - Vector256.Load(shift + i)) & valid;
                Vector256.Store(Vector256.Load(count + i) + (one & valid), count + i);
                Vector256.Store(Vector256.Load(s1 + i) + d, s1 + i);
                Vector256.Store(Vector256.Load(s2 + i) + d * d, s2 + i);
            }
        }
        for (; i < n; i++)
        {
            double v = values.Load(x + 4 * i);
            if (!double.IsNaN(v)) { double d = v - shift[i]; count[i]++; s1[i] += d; s2[i] += d * d; }
        }
    }

    /// <summary>
    /// <see cref="SumShifted"/> for four frames at once: the sums are loaded and stored once per
    /// four values of a cell, which keeps the loop on the frames rather than on the sums.
    /// </summary>
    static unsafe void SumShifted4<TValues>(byte* x0, byte* x1, byte* x2, byte* x3, int n, TValues values,
        double* shift, double* count, double* s1, double* s2) where TValues : struct, IStoredFloats
    {
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var one = Vector256.Create(1.0);
            for (; i + 4 <= n; i += 4)
            {
                var k = Vector256.Load(shift + i);
                var c = Vector256.Load(count + i);
                var a = Vector256.Load(s1 + i);
                var b = Vector256.Load(s2 + i);
                Accumulate(values.Load4(x0 + 4 * i), k, one, ref c, ref a, ref b);
                Accumulate(values.Load4(x1 + 4 * i), k, one, ref c, ref a, ref b);
                Accumulate(values.Load4(x2 + 4 * i), k, one, ref c, ref a, ref b);
                Accumulate(values.Load4(x3 + 4 * i), k, one, ref c, ref a, ref b);
                Vector256.Store(c, count + i);
                Vector256.Store(a, s1 + i);
                Vector256.Store(b, s2 + i);
            }
        }
        if (i < n)
        {
            long skip = 4L * i;
            SumShifted(x0 + skip, n - i, values, shift + i, count + i, s1 + i, s2 + i);
            SumShifted(x1 + skip, n - i, values, shift + i, count + i, s1 + i, s2 + i);
            SumShifted(x2 + skip, n - i, values, shift + i, count + i, s1 + i, s2 + i);
            SumShifted(x3 + skip, n - i, values, shift + i, count + i, s1 + i, s2 + i);
        }
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    static void Accumulate(Vector256<double> v, Vector256<double> shift, Vector256<double> one, ref Vector256<double> n, ref Vector256<double> s1, ref Vector256<double> s2)
    {
        var valid = Vector256.Equals(v, v);
        var d = (v - shift) & valid;
        n += one & valid;
        s1 += d;
        s2 += d * d;
    }

    /// <summary>Shifted sums → the batch's mean (into s1) and M2 (into s2); cells without values keep zeros.</summary>
    static void BatchMoments(ReadOnlySpan<double> count, ReadOnlySpan<double> shift, Span<double> s1, Span<double> s2)
    {
        for (int i = 0; i < count.Length; i++)
        {
            double n = count[i];
            if (n == 0) { s1[i] = 0; s2[i] = 0; continue; }
            double mean = s1[i] / n;
            s2[i] = Math.Max(0, s2[i] - s1[i] * mean);
            s1[i] = shift[i] + mean;
        }
    }

    /// <summary>The Chan et al. merge of a batch's (count, mean, M2) into the state's, four cells at a time.</summary>
    static void MergeBatch(Span<double> count, Span<double> mean, Span<double> m2, ReadOnlySpan<double> bn, ReadOnlySpan<double> bmean, ReadOnlySpan<double> bm2)
    {
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
            for (; i + 4 <= count.Length; i += 4)
            {
                var nb = Vector256.Create(bn.Slice(i, 4));
                var has = Vector256.GreaterThan(nb, Vector256<double>.Zero);
                var na = Vector256.Create(count.Slice(i, 4)); var ma = Vector256.Create(mean.Slice(i, 4)); var qa = Vector256.Create(m2.Slice(i, 4));
                var total = na + nb;
                var share = nb / total; // NaN only where both counts are 0, and then not used
                var delta = Vector256.Create(bmean.Slice(i, 4)) - ma;
                Vector256.ConditionalSelect(has, total, na).CopyTo(count.Slice(i, 4));
                Vector256.ConditionalSelect(has, ma + delta * share, ma).CopyTo(mean.Slice(i, 4));
                Vector256.ConditionalSelect(has, qa + Vector256.Create(bm2.Slice(i, 4)) + delta * delta * (na * share), qa).CopyTo(m2.Slice(i, 4));
            }
        for (; i < count.Length; i++)
        {
            double nb = bn[i];
            if (nb == 0) continue;
            double na = count[i], total = na + nb, delta = bmean[i] - mean[i];
            mean[i] += delta * (nb / total);
            m2[i] += bm2[i] + delta * delta * (na * nb / total);
            count[i] = total;
        }
    }



    static void Update(Vector256<double> x, Span<double> count, Span<double> mean, Span<double> m2, Vector256<double> one)
    {
        var valid = Vector256.Equals(x, x);
        var n = Vector256.Create(count) + (one & valid);
        var m = Vector256.Create(mean);
        var delta = x - m;
        var updated = Vector256.ConditionalSelect(valid, m + delta / n, m);
        var spread = Vector256.ConditionalSelect(valid, Vector256.Create(m2) + delta * (x - updated), Vector256.Create(m2));
        n.CopyTo(count);
        updated.CopyTo(mean);
        spread.CopyTo(m2);
    }

    /// <summary>Merges another partial state of the same shape into this one (Chan et al.).</summary>
    public void Merge(MomentState other)
    {
        if (other.Slots != Slots || other.Cells != Cells) throw new ArgumentException("states differ in shape", nameof(other));
        MergeBatch(Count, Mean, M2, other.Count, other.Mean, other.M2);
    }

    /// <summary>Population standard deviation √(M2 / n) (numpy's default ddof = 0); NaN without data.</summary>
    public double StandardDeviation(int index) => Count[index] > 0 ? Math.Sqrt(Math.Max(0, M2[index]) / Count[index]) : double.NaN;

    public void Fill(int slot, Span<float> mean, Span<float> std, Span<float> count)
    {
        int at = slot * Cells, i = 0;
        ReadOnlySpan<double> n = Count.Slice(at, Cells), m = Mean.Slice(at, Cells), q = M2.Slice(at, Cells);
        if (Vector256.IsHardwareAccelerated)
        {
            var nan = Vector256.Create(double.NaN);
            for (; i + 4 <= Cells; i += 4)
            {
                var k = Vector256.Create(n.Slice(i, 4));
                var has = Vector256.GreaterThan(k, Vector256<double>.Zero);
                var sd = Vector256.Sqrt(Vector256.Max(Vector256<double>.Zero, Vector256.Create(q.Slice(i, 4))) / k);
                Narrow(Vector256.ConditionalSelect(has, Vector256.Create(m.Slice(i, 4)), nan)).CopyTo(mean.Slice(i, 4));
                Narrow(Vector256.ConditionalSelect(has, sd, nan)).CopyTo(std.Slice(i, 4));
                Narrow(k).CopyTo(count.Slice(i, 4));
            }
        }
        for (; i < Cells; i++)
        {
            mean[i] = (float)MeanOrNaN(at + i);
            std[i] = (float)StandardDeviation(at + i);
            count[i] = (float)n[i];
        }
    }

    static Vector128<float> Narrow(Vector256<double> v) => Vector128.Narrow(v.GetLower(), v.GetUpper());

    public double MeanOrNaN(int index) => Count[index] > 0 ? Mean[index] : double.NaN;
}
