using MathNet.Numerics.Distributions;

namespace GridDrift.Analysis;

/// <summary>
/// The Mann–Kendall trend test (Mann 1945; Kendall 1975) with the tie-corrected variance
/// Var(S) = [n(n−1)(2n+5) − Σ t(t−1)(2t+5)] / 18 and the continuity-corrected
/// Z = (S − sign S)/√Var(S); and the Hamed &amp; Rao (1998, J. Hydrology 204: 182) correction for
/// autocorrelation: the series is detrended by Sen's slope, its ranks' autocorrelations ρ_k that
/// are significant at 5 % (|ρ_k| > 1.96/√n) enter n/n* = 1 + 2/(n(n−1)(n−2)) Σ (n−k)(n−k−1)(n−k−2) ρ_k,
/// and Var*(S) = Var(S) · n/n*. Two-sided p-values from the normal distribution.
/// </summary>
internal static class MannKendall
{
    public readonly record struct Result(int N, long S, double VarS, double Z, double P, double VarSCorrected, double ZCorrected, double PCorrected);

    public static double VarianceOfS(ReadOnlySpan<double> x)
    {
        double n = x.Length;
        double v = n * (n - 1) * (2 * n + 5);
        foreach (int g in Ranks.TieGroups(x)) v -= (double)g * (g - 1) * (2 * g + 5);
        return v / 18;
    }

    public static double ZOf(long s, double variance) =>
        variance <= 0 ? 0 : s > 0 ? (s - 1) / Math.Sqrt(variance) : s < 0 ? (s + 1) / Math.Sqrt(variance) : 0;

    public static double TwoSidedP(double z) => 2 * (1 - Normal.CDF(0, 1, Math.Abs(z)));

    public static Result Test(ReadOnlySpan<double> t, ReadOnlySpan<double> x) => Test(t, x, null);

    /// <param name="senSlope">Sen's slope of the same series when already known (it detrends for Hamed–Rao)</param>
    public static Result Test(ReadOnlySpan<double> t, ReadOnlySpan<double> x, double? senSlope)
    {
        int n = x.Length;
        if (n < 3) return new Result(n, 0, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN);
        long s = Ranks.KendallS(x);
        double variance = VarianceOfS(x);
        double z = ZOf(s, variance);
        double factor = HamedRaoFactor(t, x, senSlope);
        double corrected = variance * factor;
        double zc = ZOf(s, corrected);
        return new Result(n, s, variance, z, TwoSidedP(z), corrected, zc, TwoSidedP(zc));
    }

    /// <summary>n/n* of Hamed &amp; Rao from the significant lag autocorrelations of the detrended series' ranks.</summary>
    public static double HamedRaoFactor(ReadOnlySpan<double> t, ReadOnlySpan<double> x, double? senSlope = null)
    {
        int n = x.Length;
        double slope = senSlope ?? SenSlope.Compute(t, x).Slope;
        var detrended = new double[n];
        for (int i = 0; i < n; i++) detrended[i] = x[i] - slope * t[i];
        var ranks = Ranks.MidRanks(detrended);
        var acf = Autocorrelation(ranks, n - 1);
        double bound = 1.96 / Math.Sqrt(n), sum = 0;
        for (int k = 1; k < n; k++)
            if (Math.Abs(acf[k]) > bound) sum += (double)(n - k) * (n - k - 1) * (n - k - 2) * acf[k];
        double factor = 1 + 2.0 / ((double)n * (n - 1) * (n - 2)) * sum;
        return factor > 0 ? factor : 1;
    }

    /// <summary>
    /// Sample autocorrelation as statsmodels' acf (adjusted = False): Σ (x_t − x̄)(x_{t+k} − x̄) / Σ (x_t − x̄)²,
    /// by the Wiener–Khinchin route for long series (FFT of the zero-padded deviations, |X|², inverse FFT),
    /// directly for short ones.
    /// </summary>
    public static double[] Autocorrelation(ReadOnlySpan<double> x, int maxLag)
    {
        int n = x.Length;
        double mean = 0;
        foreach (var v in x) mean += v;
        mean /= n;
        double denominator = 0;
        foreach (var v in x) denominator += (v - mean) * (v - mean);
        var acf = new double[maxLag + 1];
        if (!(denominator > 0)) return acf;
        if (n < 512)
        {
            for (int k = 0; k <= maxLag; k++)
            {
                double sum = 0;
                for (int i = 0; i + k < n; i++) sum += (x[i] - mean) * (x[i + k] - mean);
                acf[k] = sum / denominator;
            }
            return acf;
        }
        int size = 1;
        while (size < 2 * n) size <<= 1;
        var spectrum = new System.Numerics.Complex[size];
        for (int i = 0; i < n; i++) spectrum[i] = x[i] - mean;
        MathNet.Numerics.IntegralTransforms.Fourier.Forward(spectrum, MathNet.Numerics.IntegralTransforms.FourierOptions.NoScaling);
        for (int i = 0; i < size; i++) spectrum[i] = spectrum[i].Real * spectrum[i].Real + spectrum[i].Imaginary * spectrum[i].Imaginary;
        MathNet.Numerics.IntegralTransforms.Fourier.Inverse(spectrum, MathNet.Numerics.IntegralTransforms.FourierOptions.NoScaling);
        for (int k = 0; k <= maxLag; k++) acf[k] = spectrum[k].Real / size / denominator;
        return acf;
    }
}
