using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using GridDrift.Operators.Statistics;
using GridDrift.Regions;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// <see cref="PairReducer"/>'s statistics through a <see cref="SeparablePlan"/> (latitude-longitude
/// boxes on a rectilinear grid): one contiguous pass per row and distinct longitude range gives
/// the Δλ-weighted sums of the paired cells, and each box adds its rows up with their Δsinφ
/// factors. A cell is read once per distinct range instead of once per region through an index
/// (global + bands + tiles: twice instead of three times, contiguously). The values are shifted
/// by one value of the frame pair, which keeps the moments exact to far better than 1e-12
/// relative for physical fields. One reducer per worker: its row-sum buffers are reused.
/// </summary>
internal sealed class SeparablePairReducer
{
    const int Sums = 9; // Σw, Σw·a, Σw·b, Σw·a², Σw·b², Σw·a·b, Σw·|d|, Σw·d², Σw·d, with d = b − a
    readonly SeparablePlan _plan;
    readonly double[][] _rows;
    readonly double[] _box = new double[Sums];

    public SeparablePairReducer(SeparablePlan plan)
    {
        _plan = plan;
        _rows = plan.Ranges.Select(_ => new double[plan.Rows * Sums]).ToArray();
    }

    /// <summary>Per box r writes output[5r … 5r+4] = corr, rmsd, mean absolute change, valid fraction, bias (later − earlier).</summary>
    public void Reduce(ReadOnlySpan<float> earlier, ReadOnlySpan<float> later, IReadOnlyList<double> regionArea, Span<double> output)
    {
        float shift = float.NaN;
        for (int i = 0; i < earlier.Length; i++)
            if (!float.IsNaN(earlier[i]) && !float.IsNaN(later[i])) { shift = earlier[i]; break; }
        int columns = _plan.Columns;
        for (int k = 0; k < _plan.Ranges.Length; k++)
        {
            var range = _plan.Ranges[k];
            var rows = _rows[k];
            for (int j = 0; j < _plan.Rows; j++)
            {
                int from = j * columns + range.First;
                RowSums(earlier.Slice(from, range.Count), later.Slice(from, range.Count), range.Width, shift, rows.AsSpan(j * Sums, Sums));
            }
        }
        double r2 = _plan.RadiusSquared;
        for (int b = 0; b < _plan.Boxes.Length; b++)
        {
            var box = _plan.Boxes[b];
            var rows = _rows[box.Range];
            Array.Clear(_box);
            for (int t = 0; t < box.RowFactor.Length; t++)
            {
                double f = box.RowFactor[t];
                int at = (box.FirstRow + t) * Sums;
                for (int s = 0; s < Sums; s++) _box[s] += f * rows[at + s];
            }
            var slot = output.Slice(PairReducer.Stride * b, PairReducer.Stride);
            double sw = _box[0];
            if (sw <= 0)
            {
                slot[0] = slot[1] = slot[2] = slot[4] = double.NaN;
                slot[3] = 0;
                continue;
            }
            double ma = _box[1] / sw, mb = _box[2] / sw;
            double va = _box[3] / sw - ma * ma, vb = _box[4] / sw - mb * mb, cov = _box[5] / sw - ma * mb;
            slot[0] = va > 0 && vb > 0 ? Math.Clamp(cov / Math.Sqrt(va * vb), -1, 1) : double.NaN;
            slot[1] = Math.Sqrt(Math.Max(0, _box[7] / sw));
            slot[2] = _box[6] / sw;
            slot[3] = ValidFraction.Of(sw * r2, regionArea[b]);
            slot[4] = _box[8] / sw;
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    static void RowSums(ReadOnlySpan<float> x, ReadOnlySpan<float> y, double[] width, float shift, Span<double> sums)
    {
        int n = x.Length, i = 0;
        double s0 = 0, sa = 0, sb = 0, saa = 0, sbb = 0, sab = 0, sabs = 0, sdd = 0, sd = 0;
        ref float xr = ref MemoryMarshal.GetReference(x);
        ref float yr = ref MemoryMarshal.GetReference(y);
        ref double wr = ref MemoryMarshal.GetArrayDataReference(width);
        if (Vector256.IsHardwareAccelerated && n >= 4)
        {
            var v0 = Vector256<double>.Zero; var va = v0; var vb = v0; var vaa = v0; var vbb = v0; var vab = v0; var vabs = v0; var vdd = v0; var vd = v0;
            var k = Vector256.Create((double)shift);
            for (; i + 4 <= n; i += 4)
            {
                var xv = Vector256.WidenLower(Vector128.LoadUnsafe(ref xr, (nuint)i).ToVector256Unsafe());
                var yv = Vector256.WidenLower(Vector128.LoadUnsafe(ref yr, (nuint)i).ToVector256Unsafe());
                var valid = Vector256.Equals(xv, xv) & Vector256.Equals(yv, yv);
                var w = Vector256.LoadUnsafe(ref wr, (nuint)i) & valid;
                // NaN − shift stays NaN: zero the masked lanes' values, not only their weights
                var a = (xv - k) & valid;
                var b = (yv - k) & valid;
                var d = b - a;
                var wa = w * a; var wb = w * b; var wd = w * d;
                v0 += w; va += wa; vb += wb; vaa += wa * a; vbb += wb * b; vab += wa * b;
                vabs += Vector256.Abs(wd); vdd += wd * d; vd += wd;
            }
            s0 = Vector256.Sum(v0); sa = Vector256.Sum(va); sb = Vector256.Sum(vb); saa = Vector256.Sum(vaa); sbb = Vector256.Sum(vbb);
            sab = Vector256.Sum(vab); sabs = Vector256.Sum(vabs); sdd = Vector256.Sum(vdd); sd = Vector256.Sum(vd);
        }
        for (; i < n; i++)
        {
            float x0 = Unsafe.Add(ref xr, i), y0 = Unsafe.Add(ref yr, i);
            if (float.IsNaN(x0) || float.IsNaN(y0)) continue;
            double w = Unsafe.Add(ref wr, i), a = x0 - (double)shift, b = y0 - (double)shift, d = b - a;
            s0 += w; sa += w * a; sb += w * b; saa += w * a * a; sbb += w * b * b; sab += w * a * b;
            sabs += w * Math.Abs(d); sdd += w * d * d; sd += w * d;
        }
        sums[0] = s0; sums[1] = sa; sums[2] = sb; sums[3] = saa; sums[4] = sbb; sums[5] = sab; sums[6] = sabs; sums[7] = sdd; sums[8] = sd;
    }
}
