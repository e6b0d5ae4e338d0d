using System.Runtime.Intrinsics;
using GridDrift.Grids;
namespace GridDrift.Operators.Similarity;

/// <summary>
/// The structural similarity map of Wang, Bovik, Sheikh &amp; Simoncelli (2004, IEEE Trans.
/// Image Processing 13(4): 600), eq. 13 with the Gaussian window of §III-C (σ = 1.5, 11 taps,
/// normalised), K1 = 0.01, K2 = 0.03, C1 = (K1·L)², C2 = (K2·L)², on the physical values with a
/// FIXED data range L, and population (co)variances. On the sphere: along x the window wraps
/// where the grid is periodic (a global longitude circle) and reflects elsewhere (the
/// half-sample symmetric edge of scipy.ndimage's 'reflect'); along y it reflects. Missing cells
/// are handled by normalised convolution: every local moment is divided by the window weight
/// that falls on cells valid in both frames; a cell missing in either frame, or whose valid
/// window weight is below <see cref="MinWindowWeight"/>, gets no value (NaN). Moments are
/// filtered in float32 on values shifted by the earlier frame's mean (so squares stay small and keep
/// their digits) and combined in float32 in a form without cancellation (see
/// <see cref="CombineRow"/>); against scikit-image's float64 maps the difference stays below
/// 1e-5 per cell (2e-6 measured: the filters' own float32 sums dominate, a float64 combine
/// measured the same). SSIM needs the second moments only as σx² + σy² and
/// σxy, so the sum s = a + b and difference d = a − b are squared instead of a², b² and ab:
/// E[a²] + E[b²] = (E[s²] + E[d²]) / 2 and 2E[ab] = (E[s²] − E[d²]) / 2, four filtered fields
/// instead of five. For identical frames d = 0 and both halves of the ratio stay equal bit for bit.
/// The filter streams row by row: the horizontally filtered rows of the local fields live in a
/// ring of 11 rows, so a worker's memory is a few rows, not several copies of the frame.
/// </summary>
internal sealed class Ssim
{
    public const double K1 = 0.01, K2 = 0.03, Sigma = 1.5;
    /// <summary>Fraction of the window weight that must fall on valid cells for a value.</summary>
    public const double MinWindowWeight = 0.5;
    const int Fields = 5; // m, a, b, ss, dd
    const int Block = 4;  // output rows filtered together: each loaded row serves up to four of them

    readonly int _rows, _columns, _radius, _taps, _slots;
    readonly Edge _xEdge;
    readonly double _c1, _c2;
    double _shift;
    readonly float[][] _ring;       // per field: taps × columns horizontally filtered rows
    readonly float[][] _padded;     // per field: one padded source row
    readonly float[][] _out;        // per field: the vertically filtered row
    readonly float[] _kernel;
    readonly int[] _cached;         // source row held by each ring slot
    readonly int[] _sources;

    /// <summary>Whether SSIM's windows wrap around in longitude: a latitude-longitude grid whose columns go round the globe.</summary>
    public static bool PeriodicFor(Grid grid) =>
        grid.IsRectilinear && grid.RowLatitudes is { } lat && grid.ColumnLongitudes is { } lon && HorizontalGrid.FromAxes(lat, lon).IsGlobalInLongitude;

    public Ssim(int rows, int columns, bool periodicX, double rangeLow, double rangeHigh)
    {
        _rows = rows;
        _columns = columns;
        _xEdge = periodicX ? Edge.Wrap : Edge.Reflect;
        double l = rangeHigh - rangeLow;
        _c1 = (K1 * l) * (K1 * l);
        _c2 = (K2 * l) * (K2 * l);
        _radius = GaussianKernel.Truncated(Sigma).Length / 2;
        _taps = 2 * _radius + 1;
        if (_taps != SsimKernels.Taps) throw new InternalFaultException($"SSIM's window has {_taps} taps; its kernels are written for {SsimKernels.Taps}");
        _slots = Block + 2 * _radius;
        _kernel = GaussianKernel.Truncated(Sigma).Select(w => (float)w).ToArray();
        _ring = Enumerable.Range(0, Fields).Select(_ => new float[_slots * columns]).ToArray();
        _padded = Enumerable.Range(0, Fields).Select(_ => new float[columns + 2 * _radius + 16]).ToArray(); // 16 spare: the shifted filter reads a step ahead
        _out = Enumerable.Range(0, Fields).Select(_ => new float[Block * columns]).ToArray();
        _cached = new int[_slots];
        _sources = new int[_slots];
    }

    /// <summary>Writes the SSIM map of the pair (x = earlier, y = later) into <paramref name="map"/>.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Map(ReadOnlySpan<float> x, ReadOnlySpan<float> y, Span<float> map)
    {
        var (sum, _, count) = ValidPairs.Sums(x, y);
        bool complete = count == x.Length;
        _shift = count > 0 ? Math.Round(sum / count) : 0;
        Array.Fill(_cached, -1);
        int first = complete ? 1 : 0;
        for (int j0 = 0; j0 < _rows; j0 += Block)
        {
            int nb = Math.Min(Block, _rows - j0), inputs = nb + 2 * _radius;
            // the input rows of the block form one contiguous run of source rows (reflection included), so slot = row mod slots never collides
            for (int t = 0; t < inputs; t++)
            {
                int s = Edges.Index(j0 + t - _radius, _rows, Edge.Reflect);
                int slot = s % _slots;
                if (_cached[slot] != s)
                {
                    FilterSourceRow(x, y, s, slot, first);
                    _cached[slot] = s;
                }
                _sources[t] = slot * _columns;
            }
            for (int f = first; f < Fields; f++)
                if (nb == Block) SsimKernels.ColumnsBlock(_kernel, _ring[f], _sources, _columns, _out[f]);
                else
                    for (int b = 0; b < nb; b++) SsimKernels.Columns(_kernel, _ring[f], _sources.AsSpan(b, _taps), _columns, _out[f].AsSpan(b * _columns, _columns));
            for (int b = 0; b < nb; b++)
            {
                int j = j0 + b;
                CombineRow(x.Slice(j * _columns, _columns), y.Slice(j * _columns, _columns), complete, map.Slice(j * _columns, _columns), b * _columns);
            }
        }
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    void FilterSourceRow(ReadOnlySpan<float> x, ReadOnlySpan<float> y, int row, int slot, int firstField)
    {
        var xr = x.Slice(row * _columns, _columns);
        var yr = y.Slice(row * _columns, _columns);
        int r = _radius, i = 0;
        float shift = (float)_shift;
        if (Vector256.IsHardwareAccelerated)
        {
            // the interior of the row in eight-lane steps, the edges below one by one
            var vs = Vector256.Create(shift);
            var one = Vector256.Create(1f);
            for (; i + 8 <= _columns; i += 8)
            {
                var vx = Vector256.Create(xr.Slice(i, 8));
                var vy = Vector256.Create(yr.Slice(i, 8));
                var valid = Vector256.Equals(vx, vx) & Vector256.Equals(vy, vy);
                var a = (vx - vs) & valid;
                var b = (vy - vs) & valid;
                (one & valid).CopyTo(_padded[0].AsSpan(r + i));
                a.CopyTo(_padded[1].AsSpan(r + i));
                b.CopyTo(_padded[2].AsSpan(r + i));
                var sum = a + b; var difference = a - b;
                (sum * sum).CopyTo(_padded[3].AsSpan(r + i));
                (difference * difference).CopyTo(_padded[4].AsSpan(r + i));
            }
        }
        for (; i < _columns; i++) Put(xr[i], yr[i], r + i, shift);
        for (int p = 0; p < r; p++)
        {
            int left = Edges.Index(p - r, _columns, _xEdge), right = Edges.Index(_columns + p, _columns, _xEdge);
            Put(xr[left], yr[left], p, shift);
            Put(xr[right], yr[right], _columns + r + p, shift);
        }
        for (int f = firstField; f < Fields; f++) SsimKernels.Along(_kernel, _padded[f], _ring[f].AsSpan(slot * _columns, _columns));
    }

    void Put(float xi, float yi, int p, float shift)
    {
        bool valid = !float.IsNaN(xi) && !float.IsNaN(yi);
        float a = valid ? xi - shift : 0, b = valid ? yi - shift : 0;
        _padded[0][p] = valid ? 1 : 0;
        _padded[1][p] = a;
        _padded[2][p] = b;
        float sum = a + b, difference = a - b;
        _padded[3][p] = sum * sum;
        _padded[4][p] = difference * difference;
    }

    /// <summary>
    /// One row of the map from the filtered moments (ma, mb: local means of the shifted values;
    /// ss, dd: of s² and d²). SSIM's factors are written so that nothing cancels but the
    /// covariance: a1 = 2μxμy + C1 and a2 = 2σxy + C2 = (ss − dd)/2 − 2·ma·mb + C2, and the
    /// denominator's factors are these plus squares, μx² + μy² = 2μxμy + (ma − mb)² and
    /// σx² + σy² = 2σxy + σ²_d with σ²_d = dd − (ma − mb)². SSIM = a1/(a1 + e²) · a2/(a2 + σ²_d):
    /// two quotients of like magnitude, so no product overflows float32 whatever the units, and
    /// identical frames (d = 0) give exactly 1. Eight cells at a time; frames with missing cells
    /// first divide their moments by the valid window weight (normalised convolution).
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    void CombineRow(ReadOnlySpan<float> xr, ReadOnlySpan<float> yr, bool complete, Span<float> target, int offset)
    {
        var fa = _out[1].AsSpan(offset, _columns); var fb = _out[2].AsSpan(offset, _columns);
        var fss = _out[3].AsSpan(offset, _columns); var fdd = _out[4].AsSpan(offset, _columns);
        var weight = _out[0].AsSpan(offset, _columns);
        if (!complete)
            for (int k = 0; k < _columns; k++)
            {
                float inv = 1 / weight[k];
                fa[k] *= inv; fb[k] *= inv; fss[k] *= inv; fdd[k] *= inv;
            }
        float shift = (float)_shift, c1 = (float)_c1, c2 = (float)_c2;
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var vshift = Vector256.Create(shift);
            var vc1 = Vector256.Create(c1);
            var vc2 = Vector256.Create(c2);
            var half = Vector256.Create(0.5f);
            for (; i + 8 <= _columns; i += 8)
            {
                var ma = Vector256.Create(fa.Slice(i, 8)); var mb = Vector256.Create(fb.Slice(i, 8));
                var ss = Vector256.Create(fss.Slice(i, 8)); var dd = Vector256.Create(fdd.Slice(i, 8));
                var e = ma - mb;
                var e2 = e * e;
                var p = (ma + vshift) * (mb + vshift);
                var q = ma * mb;
                var a1 = (p + p) + vc1;
                var a2 = ((ss - dd) * half - (q + q)) + vc2;
                (a1 / (a1 + e2) * (a2 / (a2 + (dd - e2)))).CopyTo(target.Slice(i, 8));
            }
        }
        for (; i < _columns; i++)
        {
            float ma = fa[i], mb = fb[i], ss = fss[i], dd = fdd[i];
            float e = ma - mb, e2 = e * e;
            float p = (ma + shift) * (mb + shift), q = ma * mb;
            float a1 = (p + p) + c1, a2 = ((ss - dd) * 0.5f - (q + q)) + c2;
            target[i] = a1 / (a1 + e2) * (a2 / (a2 + (dd - e2)));
        }
        if (!complete)
            for (int k = 0; k < _columns; k++)
                if (float.IsNaN(xr[k]) || float.IsNaN(yr[k]) || weight[k] < MinWindowWeight) target[k] = float.NaN;
    }
}
