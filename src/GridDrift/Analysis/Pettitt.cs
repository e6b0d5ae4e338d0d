namespace GridDrift.Analysis;

/// <summary>
/// Pettitt's (1979, Applied Statistics 28(2): 126) non-parametric test for one change point:
/// U_t = Σ_{i≤t} Σ_{j>t} sign(x_i − x_j), computed in its rank form U_t = 2 Σ_{i≤t} r_i − t(n + 1)
/// with mid-ranks r; K = max |U_t|, the change follows the index of the maximum, and the
/// approximate significance is p ≈ 2 exp(−6K² / (n³ + n²)) (capped at 1).
/// </summary>
internal static class Pettitt
{
    /// <param name="LastBefore">0-based index of the last value before the change</param>
    public readonly record struct Result(int LastBefore, double K, double P);

    public static Result Test(ReadOnlySpan<double> x)
    {
        int n = x.Length;
        if (n < 3) return new Result(-1, double.NaN, double.NaN);
        var r = Ranks.MidRanks(x);
        double sum = 0, best = -1;
        int at = -1;
        for (int t = 0; t < n - 1; t++)
        {
            sum += r[t];
            double u = Math.Abs(2 * sum - (t + 1.0) * (n + 1));
            if (u > best) { best = u; at = t; }
        }
        double p = Math.Min(1, 2 * Math.Exp(-6 * best * best / ((double)n * n * n + (double)n * n)));
        return new Result(at, best, p);
    }

    /// <summary>log10 of the approximate p-value, computed in logs so it stays finite where p underflows.</summary>
    public static double Log10P(double k, int n) =>
        Math.Min(0, (Math.Log(2) - 6 * k * k / ((double)n * n * n + (double)n * n)) / Math.Log(10));
}
