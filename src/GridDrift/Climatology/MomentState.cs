using System.Runtime.Intrinsics;

namespace GridDrift.Climatology;

/// <summary>
/// Count, mean and sum of squared deviations (M2) per slot and cell, in float64: the running
/// update of Welford (1962, Technometrics 4(3): 419) for each new value, and the pairwise
/// combination of Chan, Golub &amp; LeVeque (1979; The American Statistician 37(3): 242, 1983)
/// to merge two partial states of disjoint samples. Partial states of disjoint periods (or of
/// shards of one record) therefore merge into the state of them all.
/// Layout: slot-major, slot s of cell c at s × Cells + c.
/// </summary>
public sealed class MomentState
{
    public int Slots { get; }
    public int Cells { get; }
    public double[] Count { get; }
    public double[] Mean { get; }
    public double[] M2 { get; }

    public MomentState(int slots, int cells)
    {
        Slots = slots;
        Cells = cells;
        long n = (long)slots * cells;
        if (n > Array.MaxLength) throw new ArgumentOutOfRangeException(nameof(cells), $"{slots} slots × {cells} cells is too many for one state");
        Count = new double[n];
        Mean = new double[n];
        M2 = new double[n];
    }

    /// <summary>Adds a frame's values for cells [start, start + values.Length) to one slot; NaN values are skipped.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Add(int slot, int start, ReadOnlySpan<float> values)
    {
        int offset = slot * Cells + start, n = values.Length, i = 0;
        var count = Count.AsSpan(offset, n); var mean = Mean.AsSpan(offset, n); var m2 = M2.AsSpan(offset, n);
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
        for (long i = 0; i < Count.LongLength; i++)
        {
            double na = Count[i], nb = other.Count[i];
            if (nb == 0) continue;
            if (na == 0)
            {
                Count[i] = nb; Mean[i] = other.Mean[i]; M2[i] = other.M2[i];
                continue;
            }
            double n = na + nb, delta = other.Mean[i] - Mean[i];
            Mean[i] += delta * (nb / n);
            M2[i] += other.M2[i] + delta * delta * (na * nb / n);
            Count[i] = n;
        }
    }

    /// <summary>Population standard deviation √(M2 / n) (numpy's default ddof = 0); NaN without data.</summary>
    public double StandardDeviation(long index) => Count[index] > 0 ? Math.Sqrt(Math.Max(0, M2[index]) / Count[index]) : double.NaN;

    public double MeanOrNaN(long index) => Count[index] > 0 ? Mean[index] : double.NaN;
}
