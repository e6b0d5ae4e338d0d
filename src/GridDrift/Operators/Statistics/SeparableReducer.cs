using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using GridDrift.Regions;

namespace GridDrift.Operators.Statistics;

/// <summary>
/// Reduces frames with a <see cref="SeparablePlan"/>: per box the weighted sum of weights, of
/// shifted values and of their squares, and the extremes, in float64. The shift is one value of
/// the frame (its first valid cell), which keeps the variance exact to far better than 1e-12
/// relative for physical fields. One reducer per worker: its row-sum buffers are reused.
/// </summary>
internal sealed class SeparableReducer
{
    readonly SeparablePlan _plan;
    // per range, per row: Σw, Σw·d, Σw·d², min, max
    readonly double[][] _sums;
    readonly float[][] _min;
    readonly float[][] _max;
    // ranges with columns of width 0 inside them (a box across the grid's seam): only these need the extremes masked
    readonly bool[] _gaps;

    public SeparableReducer(SeparablePlan plan)
    {
        _plan = plan;
        _sums = plan.Ranges.Select(_ => new double[plan.Rows * 3]).ToArray();
        _min = plan.Ranges.Select(_ => new float[plan.Rows]).ToArray();
        _max = plan.Ranges.Select(_ => new float[plan.Rows]).ToArray();
        _gaps = plan.Ranges.Select(r => r.Width.Any(w => w <= 0)).ToArray();
    }

    /// <summary>
    /// Per box r writes moments[r × 5 + k]: k = 0 Σw (valid area), 1 mean, 2 variance, 3 min, 4 max.
    /// </summary>
    public void Reduce(ReadOnlySpan<float> frame, Span<double> moments)
    {
        float shift = float.NaN;
        foreach (var v in frame) if (!float.IsNaN(v)) { shift = v; break; }
        int columns = _plan.Columns;
        for (int k = 0; k < _plan.Ranges.Length; k++)
        {
            var range = _plan.Ranges[k];
            var sums = _sums[k];
            var min = _min[k];
            var max = _max[k];
            var width = range.Width;
            for (int j = 0; j < _plan.Rows; j++)
            {
                var row = frame.Slice(j * columns + range.First, range.Count);
                RowSums(row, width, _gaps[k], shift, out double s0, out double s1, out double s2, out float lo, out float hi);
                sums[3 * j] = s0;
                sums[3 * j + 1] = s1;
                sums[3 * j + 2] = s2;
                min[j] = lo;
                max[j] = hi;
            }
        }
        double r2 = _plan.RadiusSquared;
        for (int b = 0; b < _plan.Boxes.Length; b++)
        {
            var box = _plan.Boxes[b];
            var sums = _sums[box.Range];
            var min = _min[box.Range];
            var max = _max[box.Range];
            double w = 0, wd = 0, wd2 = 0;
            float lo = float.PositiveInfinity, hi = float.NegativeInfinity;
            for (int t = 0; t < box.RowFactor.Length; t++)
            {
                int j = box.FirstRow + t;
                double f = box.RowFactor[t];
                w += f * sums[3 * j];
                wd += f * sums[3 * j + 1];
                wd2 += f * sums[3 * j + 2];
                if (f > 0 && sums[3 * j] > 0)
                {
                    if (min[j] < lo) lo = min[j];
                    if (max[j] > hi) hi = max[j];
                }
            }
            var m = moments.Slice(5 * b, 5);
            m[0] = w * r2;
            m[1] = w > 0 ? shift + wd / w : double.NaN;
            m[2] = w > 0 ? Math.Max(0, wd2 / w - (wd / w) * (wd / w)) : double.NaN;
            m[3] = w > 0 ? lo : double.NaN;
            m[4] = w > 0 ? hi : double.NaN;
        }
    }

    /// <summary>One contiguous pass over a row segment; NaN cells are left out. Float64 sums, SIMD where the hardware has it.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    static void RowSums(ReadOnlySpan<float> row, double[] width, bool gaps, float shift, out double s0, out double s1, out double s2, out float min, out float max)
    {
        int n = row.Length, i = 0;
        double a0 = 0, a1 = 0, a2 = 0;
        float lo = float.PositiveInfinity, hi = float.NegativeInfinity;
        ref float x = ref MemoryMarshal.GetReference(row);
        ref double w = ref MemoryArrayReference(width);
        if (Vector256.IsHardwareAccelerated && n >= 8)
        {
            var v0 = Vector256<double>.Zero; var v1 = Vector256<double>.Zero; var v2 = Vector256<double>.Zero;
            var vlo = Vector256.Create(float.PositiveInfinity);
            var vhi = Vector256.Create(float.NegativeInfinity);
            var vshift = Vector256.Create((double)shift);
            for (; i + 8 <= n; i += 8)
            {
                var xv = Vector256.LoadUnsafe(ref x, (nuint)i);
                var valid = Vector256.Equals(xv, xv); // false where NaN
                var wl0 = Vector256.LoadUnsafe(ref w, (nuint)i);
                var wh0 = Vector256.LoadUnsafe(ref w, (nuint)(i + 4));
                // extremes only over cells inside the box: a box across the grid's seam spans columns of width 0 between its two ends
                var counted = gaps
                    ? valid & Vector256.Narrow(Vector256.GreaterThan(wl0, Vector256<double>.Zero).AsInt64(), Vector256.GreaterThan(wh0, Vector256<double>.Zero).AsInt64()).AsSingle()
                    : valid;
                vlo = Vector256.Min(vlo, Vector256.ConditionalSelect(counted, xv, Vector256.Create(float.PositiveInfinity)));
                vhi = Vector256.Max(vhi, Vector256.ConditionalSelect(counted, xv, Vector256.Create(float.NegativeInfinity)));
                var (xl, xh) = Vector256.Widen(xv);
                var (ml, mh) = Vector256.Widen(valid.AsInt32());
                var wl = wl0 & ml.AsDouble();
                var wh = wh0 & mh.AsDouble();
                // masked-out lanes have weight 0, and NaN - shift times 0 is NaN: zero the values too
                var dl = (xl - vshift) & ml.AsDouble();
                var dh = (xh - vshift) & mh.AsDouble();
                v0 += wl + wh;
                var wdl = wl * dl; var wdh = wh * dh;
                v1 += wdl + wdh;
                v2 += wdl * dl + wdh * dh;
            }
            a0 = Vector256.Sum(v0); a1 = Vector256.Sum(v1); a2 = Vector256.Sum(v2);
            for (int k = 0; k < 8; k++)
            {
                lo = MathF.Min(lo, vlo.GetElement(k));
                hi = MathF.Max(hi, vhi.GetElement(k));
            }
        }
        for (; i < n; i++)
        {
            float x0 = Unsafe.Add(ref x, i);
            if (float.IsNaN(x0)) continue;
            double ww = Unsafe.Add(ref w, i), d = x0 - (double)shift;
            a0 += ww; a1 += ww * d; a2 += ww * d * d;
            if (ww <= 0) continue;
            if (x0 < lo) lo = x0;
            if (x0 > hi) hi = x0;
        }
        s0 = a0;
        s1 = a1;
        s2 = a2;
        min = lo;
        max = hi;
    }

    static ref double MemoryArrayReference(double[] a) => ref MemoryMarshal.GetArrayDataReference(a);
}
