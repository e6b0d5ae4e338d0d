namespace GridDrift.Analysis;

/// <summary>What changes between the segments PELT looks for.</summary>
public enum SegmentCost
{
    /// <summary>Gaussian, known variance: Σ (x − x̄_seg)² / σ², σ estimated robustly from the whole series.</summary>
    Mean,
    /// <summary>Gaussian, both free: n_seg · ln σ̂²_seg (σ̂² the segment's ML variance, floored).</summary>
    MeanAndVariance,
}

/// <summary>
/// Pruned exact linear time search for multiple change points (Killick, Fearnhead &amp; Eckley
/// 2012, JASA 107: 1590): F(t) = min_τ F(τ) + C(x_{τ+1..t}) + β over admissible τ, pruning
/// every τ with F(τ) + C(x_{τ+1..t}) > F(t) (the costs here satisfy the paper's condition
/// with K = 0). Costs are twice the negative Gaussian log-likelihood (constants dropped) from
/// prefix sums. Without a given penalty it is the BIC's, β = p · ln n per change, with p the parameters
/// each new segment adds: its location and its mean (p = 2 for <see cref="SegmentCost.Mean"/>), and
/// its variance too (p = 3 for <see cref="SegmentCost.MeanAndVariance"/>); the series analysis
/// gives whitened series and the penalty calibrated to a stated level (<see cref="PeltPenalty"/>).
/// Segments are at least <c>minSegment</c> long. Without a given noise variance the σ of the mean
/// cost comes from the first differences and allows for AR(1) noise (<see cref="RobustNoise"/>).
/// </summary>
internal static class Pelt
{
    /// <returns>0-based indices of the first value of each new segment, ascending.</returns>
    public static int[] Detect(ReadOnlySpan<double> x, SegmentCost cost, double? penalty = null, int minSegment = 10, double? noiseVariance = null)
    {
        int n = x.Length;
        minSegment = Math.Max(cost == SegmentCost.MeanAndVariance ? 2 : 1, minSegment);
        if (n < 2 * minSegment) return [];
        int p = cost == SegmentCost.Mean ? 2 : 3;
        double beta = penalty ?? p * Math.Log(n);
        var s1 = new double[n + 1];
        var s2 = new double[n + 1];
        for (int i = 0; i < n; i++)
        {
            s1[i + 1] = s1[i] + x[i];
            s2[i + 1] = s2[i] + x[i] * x[i];
        }
        double sigma2 = cost == SegmentCost.Mean ? noiseVariance ?? Math.Pow(RobustNoise(x), 2) : 0;
        if (cost == SegmentCost.Mean && !(sigma2 > 0)) return [];
        double totalVariance = (s2[n] - s1[n] * s1[n] / n) / n;
        double floor = Math.Max(1e-12 * Math.Max(totalVariance, 1e-300), 1e-300);

        double Cost(int a, int b) // segment x[a..b)
        {
            int m = b - a;
            double sum = s1[b] - s1[a], sq = s2[b] - s2[a];
            double ss = Math.Max(0, sq - sum * sum / m);
            return cost == SegmentCost.Mean ? ss / sigma2 : m * Math.Log(Math.Max(ss / m, floor));
        }

        var f = new double[n + 1];
        var last = new int[n + 1];
        var prunedFrom = new int[n + 1]; // a pruned τ still serves the steps before its path via t becomes admissible
        Array.Fill(prunedFrom, int.MaxValue);
        f[0] = -beta;
        var candidates = new List<int> { 0 };
        for (int t = minSegment; t <= n; t++)
        {
            double best = double.PositiveInfinity;
            int arg = -1;
            candidates.RemoveAll(tau => prunedFrom[tau] <= t);
            foreach (int tau in candidates)
            {
                if (t - tau < minSegment) continue;
                double v = f[tau] + Cost(tau, t) + beta;
                if (v < best) { best = v; arg = tau; }
            }
            f[t] = best;
            last[t] = arg;
            if (arg < 0) continue;
            foreach (int tau in candidates)
                if (t - tau >= minSegment && f[tau] + Cost(tau, t) > best)
                    prunedFrom[tau] = Math.Min(prunedFrom[tau], t + minSegment);
            if (t <= n - minSegment) candidates.Add(t);
        }
        var changes = new List<int>();
        for (int t = n; t > 0 && last[t] >= 0; t = last[t])
            if (last[t] > 0) changes.Add(last[t]);
        changes.Reverse();
        return changes.ToArray();
    }

    /// <summary>
    /// The noise σ of the mean cost, robust to shifts in the mean and allowing for AR(1) noise:
    /// from the first differences d, σ_d = 1.4826 · MAD(d) and their lag-1 autocorrelation r_d
    /// (values beyond 5 σ_d from the median clipped, so a shift does not count), ρ = 1 + 2 r_d
    /// clamped to [0, 0.95] (for AR(1) noise r_d = −(1 − ρ)/2), σ² = σ_d² / (2(1 − ρ)) and the
    /// long-run variance σ² (1 + ρ)/(1 − ρ) — the variance that governs a segment mean. For white
    /// noise ρ = 0 and this is σ_d / √2.
    /// </summary>
    public static double RobustNoise(ReadOnlySpan<double> x)
    {
        if (x.Length < 4) return double.NaN;
        var d = new double[x.Length - 1];
        for (int i = 1; i < x.Length; i++) d[i - 1] = x[i] - x[i - 1];
        double median = RobustStatistics.Median(d), sd = RobustStatistics.Mad(d) * RobustStatistics.MadScale;
        if (!(sd > 0)) return sd;
        for (int i = 0; i < d.Length; i++) d[i] = Math.Clamp(d[i] - median, -5 * sd, 5 * sd);
        double num = 0, den = 0;
        for (int i = 0; i < d.Length; i++)
        {
            den += d[i] * d[i];
            if (i > 0) num += d[i] * d[i - 1];
        }
        double rho = Math.Clamp(1 + 2 * (den > 0 ? num / den : 0), 0, 0.95);
        double variance = sd * sd / (2 * (1 - rho)) * (1 + rho) / (1 - rho);
        return Math.Sqrt(variance);
    }
}
