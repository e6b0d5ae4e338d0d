using MathNet.Numerics.Distributions;

namespace GridDrift.Analysis;

/// <summary>One detector's verdict on one value: its score, the threshold the score is held against, and whether it is flagged.</summary>
internal readonly record struct Flag(double Score, double Threshold, bool Flagged);

/// <summary>The outlier detectors of a series (NaN values get NaN scores and no flag).</summary>
internal static class Outliers
{
    /// <summary>
    /// Robust z-score: (x − median) / (1.4826 · MAD), flagged where |z| exceeds 3.5 (the cut-off
    /// Iglewicz &amp; Hoaglin 1993 recommend for the modified z-score).
    /// </summary>
    public static Flag[] RobustZ(ReadOnlySpan<double> x, double threshold = 3.5)
    {
        var valid = Valid(x);
        double median = RobustStatistics.Median(valid), scale = RobustStatistics.MadScale * RobustStatistics.Mad(valid);
        var flags = new Flag[x.Length];
        for (int i = 0; i < x.Length; i++)
        {
            double z = double.IsNaN(x[i]) || !(scale > 0) ? double.NaN : (x[i] - median) / scale;
            flags[i] = new Flag(z, threshold, Math.Abs(z) > threshold);
        }
        return flags;
    }

    /// <summary>
    /// Hampel filter (Hampel 1974; Pearson 2002): a value is flagged where it departs from the median
    /// of the centred window of 2k + 1 values by more than t · 1.4826 · MAD of that window
    /// (k = 3, t = 3 by default; the window shrinks at the ends). Score = departure / (1.4826 · MAD).
    /// </summary>
    public static Flag[] Hampel(ReadOnlySpan<double> x, int halfWindow = 3, double threshold = 3)
    {
        var flags = new Flag[x.Length];
        var window = new List<double>(2 * halfWindow + 1);
        for (int i = 0; i < x.Length; i++)
        {
            window.Clear();
            for (int j = Math.Max(0, i - halfWindow); j <= Math.Min(x.Length - 1, i + halfWindow); j++)
                if (!double.IsNaN(x[j])) window.Add(x[j]);
            var w = window.ToArray();
            double median = RobustStatistics.Median(w), scale = RobustStatistics.MadScale * RobustStatistics.Mad(w);
            double score = double.IsNaN(x[i]) || w.Length < 3 ? double.NaN : scale > 0 ? Math.Abs(x[i] - median) / scale : x[i] == median ? 0 : double.PositiveInfinity;
            flags[i] = new Flag(score, threshold, score > threshold);
        }
        return flags;
    }

    /// <summary>
    /// Tukey's (1977) fences: flagged below Q1 − 1.5 IQR or above Q3 + 1.5 IQR (quartiles by linear
    /// interpolation, numpy's default). Score = distance outside the nearer quartile in IQRs (0 inside the box).
    /// </summary>
    public static Flag[] TukeyFences(ReadOnlySpan<double> x, double k = 1.5)
    {
        var valid = Valid(x);
        double q1 = RobustStatistics.Quantile(valid, 0.25), q3 = RobustStatistics.Quantile(valid, 0.75), iqr = q3 - q1;
        var flags = new Flag[x.Length];
        for (int i = 0; i < x.Length; i++)
        {
            double v = x[i];
            double score = double.IsNaN(v) || !(iqr > 0) ? double.NaN : v < q1 ? (q1 - v) / iqr : v > q3 ? (v - q3) / iqr : 0;
            flags[i] = new Flag(score, k, score > k);
        }
        return flags;
    }

    /// <summary>
    /// Seasonal residual: the series minus a least-squares fit of a constant, a linear trend and the
    /// first <paramref name="harmonics"/> annual harmonics of time (in days, year = <paramref name="yearDays"/>),
    /// then the robust z-score of the residuals (harmonic regression; cf. the seasonal-trend
    /// decomposition of Cleveland et al. 1990).
    /// </summary>
    public static Flag[] SeasonalResidual(ReadOnlySpan<double> days, ReadOnlySpan<double> x, int harmonics = 3, double yearDays = 365.2425, double threshold = 3.5) =>
        RobustZ(SeasonalModel.Residuals(days, x, harmonics, yearDays), threshold);

    /// <summary>
    /// Generalized ESD (Rosner 1983, Technometrics 25(2): 165), as the NIST/SEMATECH e-Handbook
    /// (§1.3.5.17.3) states it: up to r candidates removed one by one, R_i = max|x − x̄|/s of what
    /// remains, λ_i = (n − i) t_{p, n−i−1} / √((n − i − 1 + t²)(n − i + 1)), p = 1 − α/(2(n − i + 1));
    /// the outliers are the first m candidates, m the largest i with R_i > λ_i. Score = R_i, threshold λ_i,
    /// for the candidates; 0 and NaN elsewhere.
    /// </summary>
    public static Flag[] GeneralizedEsd(ReadOnlySpan<double> x, int maxOutliers = 10, double alpha = 0.05) =>
        GeneralizedEsdSteps(x, maxOutliers, alpha).Flags;

    public static (Flag[] Flags, double[] R, double[] Lambda, int Outliers) GeneralizedEsdSteps(ReadOnlySpan<double> x, int maxOutliers = 10, double alpha = 0.05)
    {
        var remaining = new List<int>();
        for (int i = 0; i < x.Length; i++) if (!double.IsNaN(x[i])) remaining.Add(i);
        int n = remaining.Count;
        int r = Math.Min(maxOutliers, Math.Max(0, n - 3));
        var candidates = new int[r];
        var R = new double[r];
        var lambda = new double[r];
        int outliers = 0;
        for (int step = 1; step <= r; step++)
        {
            double mean = 0;
            foreach (int i in remaining) mean += x[i];
            mean /= remaining.Count;
            double ss = 0;
            foreach (int i in remaining) ss += (x[i] - mean) * (x[i] - mean);
            double sd = Math.Sqrt(ss / (remaining.Count - 1));
            int worst = remaining[0];
            foreach (int i in remaining) if (Math.Abs(x[i] - mean) > Math.Abs(x[worst] - mean)) worst = i;
            R[step - 1] = sd > 0 ? Math.Abs(x[worst] - mean) / sd : 0;
            double p = 1 - alpha / (2.0 * (n - step + 1));
            double tq = StudentT.InvCDF(0, 1, n - step - 1, p);
            lambda[step - 1] = (n - step) * tq / Math.Sqrt((n - step - 1 + tq * tq) * (n - step + 1));
            if (R[step - 1] > lambda[step - 1]) outliers = step;
            candidates[step - 1] = worst;
            remaining.Remove(worst);
        }
        var flags = new Flag[x.Length];
        for (int i = 0; i < x.Length; i++) flags[i] = new Flag(double.IsNaN(x[i]) ? double.NaN : 0, double.NaN, false);
        for (int k = 0; k < r; k++) flags[candidates[k]] = new Flag(R[k], lambda[k], k < outliers);
        return (flags, R, lambda, outliers);
    }

    static double[] Valid(ReadOnlySpan<double> x)
    {
        var list = new List<double>(x.Length);
        foreach (var v in x) if (!double.IsNaN(v)) list.Add(v);
        return list.ToArray();
    }
}
