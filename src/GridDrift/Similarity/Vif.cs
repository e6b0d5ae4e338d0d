namespace GridDrift.Similarity;

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
public sealed class Vif
{
    const double SigmaNoise = 2, Guard = 1e-10;
    readonly SeparableFilter[] _filters = Enumerable.Range(1, 4)
        .Select(s => { int n = (1 << (5 - s)) + 1; return new SeparableFilter(GaussianKernel.WithRadius(n / 5.0, n / 2)); }).ToArray();

    /// <summary>Smallest box side for which the fourth scale keeps at least one position.</summary>
    public const int MinimumSide = 40;

    /// <summary>VIF of reference against distorted, both rows × columns, already rescaled to 0–255; NaN if the box is too small.</summary>
    public double Compute(double[] reference, double[] distorted, int rows, int columns)
    {
        double num = 0, den = 0;
        var r = reference;
        var d = distorted;
        for (int scale = 1; scale <= 4; scale++)
        {
            var filter = _filters[scale - 1];
            int k = filter.Radius;
            if (scale > 1)
            {
                int fr = rows - 2 * k, fc = columns - 2 * k;
                if (fr < 1 || fc < 1) return double.NaN;
                var rf = new double[fr * fc];
                var df = new double[fr * fc];
                filter.Valid(r, rows, columns, rf);
                filter.Valid(d, rows, columns, df);
                int nr = (fr + 1) / 2, nc = (fc + 1) / 2;
                r = Decimate(rf, fr, fc, nr, nc);
                d = Decimate(df, fr, fc, nr, nc);
                rows = nr;
                columns = nc;
            }
            int outRows = rows - 2 * k, outColumns = columns - 2 * k;
            if (outRows < 1 || outColumns < 1) return double.NaN;
            int m = outRows * outColumns;
            var mu1 = new double[m]; var mu2 = new double[m];
            var s11 = new double[m]; var s22 = new double[m]; var s12 = new double[m];
            var rr = new double[rows * columns]; var dd = new double[rows * columns]; var rd = new double[rows * columns];
            for (int i = 0; i < rr.Length; i++) { rr[i] = r[i] * r[i]; dd[i] = d[i] * d[i]; rd[i] = r[i] * d[i]; }
            filter.Valid(r, rows, columns, mu1);
            filter.Valid(d, rows, columns, mu2);
            filter.Valid(rr, rows, columns, s11);
            filter.Valid(dd, rows, columns, s22);
            filter.Valid(rd, rows, columns, s12);
            for (int i = 0; i < m; i++)
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
        }
        return num / den;
    }

    /// <summary>Every second row and column from the first (MATLAB's x(1:2:end, 1:2:end)).</summary>
    static double[] Decimate(double[] field, int rows, int columns, int newRows, int newColumns)
    {
        var result = new double[newRows * newColumns];
        for (int j = 0; j < newRows; j++)
            for (int i = 0; i < newColumns; i++)
                result[j * newColumns + i] = field[(2 * j) * columns + 2 * i];
        return result;
    }
}
