using System.Runtime.Intrinsics;
using GridDrift.Frames;

namespace GridDrift.Climatology;

/// <summary>
/// Count, mean and sum of squared deviations (M2) per slot and cell, in float64: the running
/// update of Welford (1962, Technometrics 4(3): 419) for each new value, and the pairwise
/// combination of Chan, Golub &amp; LeVeque (1979; The American Statistician 37(3): 242, 1983)
/// to merge two partial states of disjoint samples (and a batch of frames into the state). Partial states of disjoint periods (or of
/// shards of one record) therefore merge into the state of them all.
/// Layout: slot-major, slot s of cell c at s × Cells + c.
/// </summary>
public sealed class MomentState : IClimatologySlots, IDisposable
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
    /// Adds several frames (frame f at f × Cells in <paramref name="frames"/>) to one slot for cells [start, start + length). The frames' own count, mean
    /// and M2 come from one pass of sums of d and d² with d = x − K, shifted by K = the state's
    /// running mean (or the first frame's value where the state is empty), so the sums stay small
    /// and keep their digits (the shifted-data algorithm; Chan, Golub &amp; LeVeque 1983, §3); they
    /// are then merged into the state by the Chan et al. update. One division per cell per call
    /// instead of one per frame, and the state read and written once per call: a diurnal
    /// climatology's state is far larger than the caches, and its slots recur only daily.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void AddFrames(int slot, int start, int length, ReadOnlySpan<float> frames, ReadOnlySpan<int> members)
    {
        if (members.Length == 1)
        {
            Add(slot, start, frames.Slice(members[0] * Cells + start, length));
            return;
        }
        const int BlockCells = 1024; // the four sums of a block stay in the first-level cache
        Span<double> bn = stackalloc double[BlockCells], s1 = stackalloc double[BlockCells], s2 = stackalloc double[BlockCells], shift = stackalloc double[BlockCells];
        for (int block = 0; block < length; block += BlockCells)
        {
            int n = Math.Min(BlockCells, length - block), from = start + block;
            int at = slot * Cells + from;
            var cn = bn[..n]; var c1 = s1[..n]; var c2 = s2[..n]; var k = shift[..n];
            cn.Clear(); c1.Clear(); c2.Clear();
            var first = frames.Slice(members[0] * Cells, Cells);
            for (int i = 0; i < n; i++)
            {
                double x = first[from + i];
                k[i] = Count[at + i] > 0 ? Mean[at + i] : double.IsNaN(x) ? 0 : x;
            }
            int m = 0;
            for (; m + 4 <= members.Length; m += 4)
                SumShifted4(frames.Slice(members[m] * Cells + from, n), frames.Slice(members[m + 1] * Cells + from, n),
                    frames.Slice(members[m + 2] * Cells + from, n), frames.Slice(members[m + 3] * Cells + from, n), k, cn, c1, c2);
            for (; m < members.Length; m++) SumShifted(frames.Slice(members[m] * Cells + from, n), k, cn, c1, c2);
            BatchMoments(cn, k, c1, c2);
            MergeBatch(Count.Slice(at, n), Mean.Slice(at, n), M2.Slice(at, n), cn, c1, c2);
        }
    }

    /// <summary>count += valid; s1 += d; s2 += d² with d = x − shift, NaN values left out.</summary>
    static void SumShifted(ReadOnlySpan<float> x, ReadOnlySpan<double> shift, Span<double> count, Span<double> s1, Span<double> s2)
    {
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var one = Vector256.Create(1.0);
            for (; i + 4 <= x.Length; i += 4)
            {
                var v = Vector256.WidenLower(Vector128.Create(x.Slice(i, 4)).ToVector256Unsafe());
                var valid = Vector256.Equals(v, v);
                var d = (v - Vector256.Create(shift.Slice(i, 4))) & valid;
                (Vector256.Create(count.Slice(i, 4)) + (one & valid)).CopyTo(count.Slice(i, 4));
                (Vector256.Create(s1.Slice(i, 4)) + d).CopyTo(s1.Slice(i, 4));
                (Vector256.Create(s2.Slice(i, 4)) + d * d).CopyTo(s2.Slice(i, 4));
            }
        }
        for (; i < x.Length; i++)
            if (!float.IsNaN(x[i])) { double d = x[i] - shift[i]; count[i]++; s1[i] += d; s2[i] += d * d; }
    }

    /// <summary>
    /// <see cref="SumShifted"/> for four frames at once: the sums are loaded and stored once per
    /// four values of a cell, which keeps the loop on the frames rather than on the sums.
    /// </summary>
    static void SumShifted4(ReadOnlySpan<float> x0, ReadOnlySpan<float> x1, ReadOnlySpan<float> x2, ReadOnlySpan<float> x3,
        ReadOnlySpan<double> shift, Span<double> count, Span<double> s1, Span<double> s2)
    {
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var one = Vector256.Create(1.0);
            for (; i + 4 <= x0.Length; i += 4)
            {
                var k = Vector256.Create(shift.Slice(i, 4));
                var n = Vector256.Create(count.Slice(i, 4));
                var a = Vector256.Create(s1.Slice(i, 4));
                var b = Vector256.Create(s2.Slice(i, 4));
                Accumulate(x0.Slice(i, 4), k, one, ref n, ref a, ref b);
                Accumulate(x1.Slice(i, 4), k, one, ref n, ref a, ref b);
                Accumulate(x2.Slice(i, 4), k, one, ref n, ref a, ref b);
                Accumulate(x3.Slice(i, 4), k, one, ref n, ref a, ref b);
                n.CopyTo(count.Slice(i, 4));
                a.CopyTo(s1.Slice(i, 4));
                b.CopyTo(s2.Slice(i, 4));
            }
        }
        if (i < x0.Length)
        {
            SumShifted(x0[i..], shift[i..], count[i..], s1[i..], s2[i..]);
            SumShifted(x1[i..], shift[i..], count[i..], s1[i..], s2[i..]);
            SumShifted(x2[i..], shift[i..], count[i..], s1[i..], s2[i..]);
            SumShifted(x3[i..], shift[i..], count[i..], s1[i..], s2[i..]);
        }
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    static void Accumulate(ReadOnlySpan<float> x, Vector256<double> shift, Vector256<double> one, ref Vector256<double> n, ref Vector256<double> s1, ref Vector256<double> s2)
    {
        var v = Vector256.WidenLower(Vector128.Create(x).ToVector256Unsafe());
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
        int at = slot * Cells;
        for (int i = 0; i < Cells; i++)
        {
            mean[i] = (float)MeanOrNaN(at + i);
            std[i] = (float)StandardDeviation(at + i);
            count[i] = (float)Count[at + i];
        }
    }

    public double MeanOrNaN(int index) => Count[index] > 0 ? Mean[index] : double.NaN;
}
