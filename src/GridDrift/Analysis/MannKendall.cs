namespace GridDrift.Analysis;

/// <summary>
/// The Mann–Kendall trend test (Mann 1945; Kendall 1975) with the tie-corrected variance
/// Var(S) = [n(n−1)(2n+5) − Σ t(t−1)(2t+5)] / 18, the continuity-corrected
/// Z = (S − sign S)/√Var(S) and the two-sided normal p-value (from erfc, <see cref="PValues"/>).
/// These hold for independent values; the series analysis applies them to whitened series
/// (<see cref="Prewhitened.MannKendall"/>).
/// </summary>
internal static class MannKendall
{
    public readonly record struct Result(int N, long S, double VarS, double Z, double P);

    public static double VarianceOfS(ReadOnlySpan<double> x)
    {
        double n = x.Length;
        double v = n * (n - 1) * (2 * n + 5);
        foreach (int g in Ranks.TieGroups(x)) v -= (double)g * (g - 1) * (2 * g + 5);
        return v / 18;
    }

    public static double ZOf(long s, double variance) =>
        variance <= 0 ? 0 : s > 0 ? (s - 1) / Math.Sqrt(variance) : s < 0 ? (s + 1) / Math.Sqrt(variance) : 0;

    public static Result Test(ReadOnlySpan<double> x)
    {
        int n = x.Length;
        if (n < 3) return new Result(n, 0, double.NaN, double.NaN, double.NaN);
        long s = Ranks.KendallS(x);
        double variance = VarianceOfS(x);
        double z = ZOf(s, variance);
        return new Result(n, s, variance, z, PValues.TwoSidedNormal(z));
    }
}
