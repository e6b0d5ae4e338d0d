using System.Runtime.Intrinsics;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// Visual information fidelity in its pixel-domain multi-scale form (Sheikh &amp; Bovik 2006,
/// IEEE Trans. Image Processing 15(2): 430; the authors' released code vifp_mscale): four
/// scales; at scale s a Gaussian window of N = 2^(5−s) + 1 taps with σ = N/5; from the second
/// scale on, both images are filtered ('valid') and decimated by 2 first; local means,
/// variances and covariance by 'valid' filtering; the gain g = σ₁₂/(σ₁² + 1e−10) and the
/// residual σᵥ² = σ₂² − g·σ₁₂ with the code's guards (1e−10); σ²_N = 2;
/// VIF = Σ log₁₀(1 + g²σ₁²/(σᵥ² + σ²_N)) / Σ log₁₀(1 + σ₁²/σ²_N), summed over all positions and
/// scales unweighted. The noise variance assumes 8-bit grey levels, so values are first rescaled
/// to 0–255 over the fixed data range. Reference = earlier frame, distorted = later frame.
/// </summary>
internal sealed class Vif
{
    const double SigmaNoise = 2, Guard = 1e-10;
    readonly SeparableFilter[] _filters = Enumerable.Range(1, 4)
        .Select(s => { int n = (1 << (5 - s)) + 1; return new SeparableFilter(GaussianKernel.WithRadius(n / 5.0, n / 2)); }).ToArray();

    // scratch reused call after call (one instance per worker): no allocation per pair once grown
    double[] _r = [], _d = [], _rf = [], _df = [], _mu1 = [], _mu2 = [], _s11 = [], _s22 = [], _s12 = [];

    static double[] Grow(ref double[] buffer, int length)
    {
        if (buffer.Length < length) buffer = new double[length];
        return buffer;
    }

    /// <summary>VIF of reference against distorted, both rows × columns, already rescaled to 0–255; NaN if the box is too small.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public double Compute(double[] reference, double[] distorted, int rows, int columns)
    {
        double num = 0, den = 0;
        ReadOnlySpan<double> r = reference.AsSpan(0, rows * columns);
        ReadOnlySpan<double> d = distorted.AsSpan(0, rows * columns);
        for (int scale = 1; scale <= 4; scale++)
        {
            var filter = _filters[scale - 1];
            int k = filter.Radius;
            if (scale > 1)
            {
                int fr = rows - 2 * k, fc = columns - 2 * k;
                if (fr < 1 || fc < 1) return double.NaN;
                var rf = Grow(ref _rf, fr * fc).AsSpan(0, fr * fc);
                var df = Grow(ref _df, fr * fc).AsSpan(0, fr * fc);
                filter.Valid(r, rows, columns, rf);
                filter.Valid(d, rows, columns, df);
                int nr = (fr + 1) / 2, nc = (fc + 1) / 2;
                var nrBuffer = Grow(ref _r, nr * nc).AsSpan(0, nr * nc);
                var ndBuffer = Grow(ref _d, nr * nc).AsSpan(0, nr * nc);
                Decimate(rf, fc, nr, nc, nrBuffer);
                Decimate(df, fc, nr, nc, ndBuffer);
                r = nrBuffer;
                d = ndBuffer;
                rows = nr;
                columns = nc;
            }
            int outRows = rows - 2 * k, outColumns = columns - 2 * k;
            if (outRows < 1 || outColumns < 1) return double.NaN;
            int m = outRows * outColumns;
            var mu1 = Grow(ref _mu1, m).AsSpan(0, m); var mu2 = Grow(ref _mu2, m).AsSpan(0, m);
            var s11 = Grow(ref _s11, m).AsSpan(0, m); var s22 = Grow(ref _s22, m).AsSpan(0, m); var s12 = Grow(ref _s12, m).AsSpan(0, m);
            filter.Valid(r, rows, columns, mu1);
            filter.Valid(d, rows, columns, mu2);
            filter.Valid(r, r, rows, columns, s11);
            filter.Valid(d, d, rows, columns, s22);
            filter.Valid(r, d, rows, columns, s12);
            var (sceneNum, sceneDen) = Sums(mu1, mu2, s11, s22, s12);
            num += sceneNum;
            den += sceneDen;
        }
        return num / den;
    }

    /// <summary>
    /// Σ log10(1 + g²σ₁²/(σᵥ² + σ²_N)) and Σ log10(1 + σ₁²/σ²_N) over one scale, four positions at
    /// a time with the guards of the released code applied in its order. The logarithms are taken
    /// of products of 16 terms per lane (each term ≥ 1; a product is flushed long before it could
    /// overflow): sixteen times fewer logarithms, the same sums to ~1e-15.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    static (double Num, double Den) Sums(ReadOnlySpan<double> mu1, ReadOnlySpan<double> mu2, ReadOnlySpan<double> s11, ReadOnlySpan<double> s22, ReadOnlySpan<double> s12)
    {
        double num = 0, den = 0;
        int m = mu1.Length, i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var zero = Vector256<double>.Zero; var one = Vector256.Create(1.0); var guard = Vector256.Create(Guard);
            var noise = Vector256.Create(SigmaNoise); var limit = Vector256.Create(1e250);
            var pn = one; var pd = one;
            for (int step = 1; i + 4 <= m; i += 4, step++)
            {
                var m1 = Vector256.Create(mu1.Slice(i, 4)); var m2 = Vector256.Create(mu2.Slice(i, 4));
                var sigma1 = Vector256.Max(zero, Vector256.Create(s11.Slice(i, 4)) - m1 * m1);
                var sigma2 = Vector256.Max(zero, Vector256.Create(s22.Slice(i, 4)) - m2 * m2);
                var sigma12 = Vector256.Create(s12.Slice(i, 4)) - m1 * m2;
                var g = sigma12 / (sigma1 + guard);
                var sv = sigma2 - g * sigma12;
                var flat1 = Vector256.LessThan(sigma1, guard);
                g = Vector256.ConditionalSelect(flat1, zero, g); sv = Vector256.ConditionalSelect(flat1, sigma2, sv); sigma1 = Vector256.ConditionalSelect(flat1, zero, sigma1);
                var flat2 = Vector256.LessThan(sigma2, guard);
                g = Vector256.ConditionalSelect(flat2, zero, g); sv = Vector256.ConditionalSelect(flat2, zero, sv);
                var negative = Vector256.LessThan(g, zero);
                sv = Vector256.ConditionalSelect(negative, sigma2, sv); g = Vector256.ConditionalSelect(negative, zero, g);
                sv = Vector256.Max(sv, guard);
                pn *= one + g * g * sigma1 / (sv + noise);
                pd *= one + sigma1 / noise;
                if ((step & 15) == 0 || Vector256.GreaterThanAny(pn, limit) || Vector256.GreaterThanAny(pd, limit))
                {
                    for (int lane = 0; lane < 4; lane++) { num += Math.Log10(pn[lane]); den += Math.Log10(pd[lane]); }
                    pn = pd = one;
                }
            }
            for (int lane = 0; lane < 4; lane++) { num += Math.Log10(pn[lane]); den += Math.Log10(pd[lane]); }
        }
        for (; i < m; i++)
        {
            double sigma1 = Math.Max(0, s11[i] - mu1[i] * mu1[i]);
            double sigma2 = Math.Max(0, s22[i] - mu2[i] * mu2[i]);
            double sigma12 = s12[i] - mu1[i] * mu2[i];
            double g = sigma12 / (sigma1 + Guard);
            double sv = sigma2 - g * sigma12;
            if (sigma1 < Guard) { g = 0; sv = sigma2; sigma1 = 0; }
            if (sigma2 < Guard) { g = 0; sv = 0; }
            if (g < 0) { sv = sigma2; g = 0; }
            if (sv <= Guard) sv = Guard;
            num += Math.Log10(1 + g * g * sigma1 / (sv + SigmaNoise));
            den += Math.Log10(1 + sigma1 / SigmaNoise);
        }
        return (num, den);
    }

    /// <summary>Every second row and column from the first (MATLAB's x(1:2:end, 1:2:end)).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    static void Decimate(ReadOnlySpan<double> field, int columns, int newRows, int newColumns, Span<double> result)
    {
        for (int j = 0; j < newRows; j++)
            for (int i = 0; i < newColumns; i++)
                result[j * newColumns + i] = field[(2 * j) * columns + 2 * i];
    }
}
