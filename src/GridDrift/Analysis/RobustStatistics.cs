namespace GridDrift.Analysis;

/// <summary>Medians, MAD and quantiles for the detectors.</summary>
internal static class RobustStatistics
{
    /// <summary>1.4826 ≈ 1/Φ⁻¹(3/4): MAD × 1.4826 estimates σ of a normal sample (common practice).</summary>
    public const double MadScale = 1.4826;

    public static double Median(ReadOnlySpan<double> x)
    {
        if (x.IsEmpty) return double.NaN;
        var s = x.ToArray();
        Array.Sort(s);
        return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[s.Length / 2 - 1] + s[s.Length / 2]);
    }

    /// <summary>Median absolute deviation from the median (unscaled).</summary>
    public static double Mad(ReadOnlySpan<double> x)
    {
        double m = Median(x);
        var d = new double[x.Length];
        for (int i = 0; i < x.Length; i++) d[i] = Math.Abs(x[i] - m);
        return Median(d);
    }

    /// <summary>Short-term noise σ of a series, robust to shifts in its mean: 1.4826 · MAD of the first differences / √2.</summary>
    public static double DifferenceNoise(ReadOnlySpan<double> x)
    {
        if (x.Length < 3) return double.NaN;
        var d = new double[x.Length - 1];
        for (int i = 1; i < x.Length; i++) d[i - 1] = x[i] - x[i - 1];
        return Mad(d) * MadScale / Math.Sqrt(2);
    }

    /// <summary>The q-quantile by linear interpolation between order statistics (numpy's default; Hyndman &amp; Fan definition 7).</summary>
    public static double Quantile(ReadOnlySpan<double> x, double q)
    {
        var s = x.ToArray();
        Array.Sort(s);
        double h = (s.Length - 1) * q;
        int lo = (int)Math.Floor(h);
        int hi = Math.Min(lo + 1, s.Length - 1);
        return s[lo] + (h - lo) * (s[hi] - s[lo]);
    }
}
