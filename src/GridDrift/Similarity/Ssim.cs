namespace GridDrift.Similarity;

/// <summary>
/// The structural similarity map of Wang, Bovik, Sheikh &amp; Simoncelli (2004, IEEE Trans.
/// Image Processing 13(4): 600), eq. 13 with the Gaussian window of §III-C (σ = 1.5, 11 taps,
/// normalised), K1 = 0.01, K2 = 0.03, C1 = (K1·L)², C2 = (K2·L)², on the physical values with a
/// FIXED data range L, and population (co)variances. On the sphere: along x the window wraps
/// where the grid is periodic (a global longitude circle) and reflects elsewhere (the
/// half-sample symmetric edge of scipy.ndimage's 'reflect'). Missing cells are handled by
/// normalised convolution: every local moment is divided by the window weight that falls on
/// cells valid in both frames; a cell missing in either frame, or whose valid window weight is
/// below <see cref="MinWindowWeight"/>, gets no value (NaN). Moments are accumulated in float64
/// on values shifted by the range's lower end, which keeps the variances exact.
/// One instance per worker: its buffers are reused frame after frame.
/// </summary>
public sealed class Ssim
{
    public const double K1 = 0.01, K2 = 0.03, Sigma = 1.5;
    /// <summary>Fraction of the window weight that must fall on valid cells for a value.</summary>
    public const double MinWindowWeight = 0.5;

    readonly int _rows, _columns;
    readonly Edge _xEdge;
    readonly double _lo, _c1, _c2;
    readonly SeparableFilter _filter = new(GaussianKernel.Truncated(Sigma));
    readonly double[] _m, _a, _b, _aa, _bb, _ab;

    public Ssim(int rows, int columns, bool periodicX, double rangeLow, double rangeHigh)
    {
        _rows = rows;
        _columns = columns;
        _xEdge = periodicX ? Edge.Wrap : Edge.Reflect;
        _lo = rangeLow;
        double l = rangeHigh - rangeLow;
        _c1 = (K1 * l) * (K1 * l);
        _c2 = (K2 * l) * (K2 * l);
        int n = rows * columns;
        _m = new double[n]; _a = new double[n]; _b = new double[n];
        _aa = new double[n]; _bb = new double[n]; _ab = new double[n];
    }

    /// <summary>Writes the SSIM map of the pair (x = earlier, y = later) into <paramref name="map"/>.</summary>
    public void Map(ReadOnlySpan<float> x, ReadOnlySpan<float> y, Span<float> map)
    {
        int n = _rows * _columns;
        bool complete = true;
        for (int i = 0; i < n; i++)
        {
            float xi = x[i], yi = y[i];
            bool valid = !float.IsNaN(xi) && !float.IsNaN(yi);
            complete &= valid;
            double a = valid ? xi - _lo : 0, b = valid ? yi - _lo : 0;
            _m[i] = valid ? 1 : 0;
            _a[i] = a; _b[i] = b;
            _aa[i] = a * a; _bb[i] = b * b; _ab[i] = a * b;
        }
        foreach (var field in complete ? new[] { _a, _b, _aa, _bb, _ab } : new[] { _m, _a, _b, _aa, _bb, _ab })
            _filter.Same(field, _rows, _columns, _xEdge, Edge.Reflect, field);

        for (int i = 0; i < n; i++)
        {
            double w = complete ? 1 : _m[i];
            if (!complete && (float.IsNaN(x[i]) || float.IsNaN(y[i]) || w < MinWindowWeight))
            {
                map[i] = float.NaN;
                continue;
            }
            double ma = _a[i] / w, mb = _b[i] / w;
            double vaa = _aa[i] / w - ma * ma, vbb = _bb[i] / w - mb * mb, vab = _ab[i] / w - ma * mb;
            double mx = ma + _lo, my = mb + _lo;
            // grouped so that identical frames give exactly 1: 2(μxμy) = μx² + μy² and 2σxy = σx² + σy² bit for bit
            double a1 = 2.0 * (mx * my) + _c1, b1 = (mx * mx + my * my) + _c1;
            double a2 = 2.0 * vab + _c2, b2 = (vaa + vbb) + _c2;
            map[i] = (float)(a1 * a2 / (b1 * b2));
        }
    }
}
