namespace GridDrift.Analysis;

/// <summary>
/// Sen's (1968, JASA 63: 1379) slope: the median of the pairwise slopes (x_j − x_i)/(t_j − t_i),
/// i &lt; j, with the rank-based confidence interval of Sen's paper as scipy.stats.theilslopes
/// computes it: C = z_{1−α/2} √Var(S) with Var(S) the Mann–Kendall variance including ties;
/// the bounds are the sorted slopes of ranks round((N − C)/2) − 1 and round((N + C)/2) (0-based,
/// N = number of pairs, rounding half to even). Up to 4 million pairs the slopes are enumerated; beyond that an order
/// statistic is found by bisection on the slope value, counting the pairs below a trial slope in
/// O(n log n) (sort by x − s·t and count inversions), to 1e-12 of the slope's magnitude.
/// </summary>
internal static class SenSlope
{
    const long EnumerateUpTo = 4_000_000;

    public readonly record struct Estimate(double Slope, double Low, double High, double Intercept);

    public static Estimate Compute(ReadOnlySpan<double> t, ReadOnlySpan<double> x, double alpha = 0.05)
    {
        int n = x.Length;
        if (n < 2) return new Estimate(double.NaN, double.NaN, double.NaN, double.NaN);
        long pairs = (long)n * (n - 1) / 2;
        double variance = MannKendall.VarianceOfS(x);
        double c = MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, 1 - alpha / 2) * Math.Sqrt(variance);
        long lowRank = (long)Math.Round((pairs - c) / 2) - 1, highRank = (long)Math.Round((pairs + c) / 2);
        lowRank = Math.Clamp(lowRank, 0, pairs - 1);
        highRank = Math.Clamp(highRank, 0, pairs - 1);
        double slope, low, high;
        if (pairs <= EnumerateUpTo)
        {
            var slopes = new double[pairs];
            long k = 0;
            for (int i = 0; i < n; i++)
                for (int j = i + 1; j < n; j++)
                    slopes[k++] = (x[j] - x[i]) / (t[j] - t[i]);
            Array.Sort(slopes);
            slope = pairs % 2 == 1 ? slopes[pairs / 2] : 0.5 * (slopes[pairs / 2 - 1] + slopes[pairs / 2]);
            low = slopes[lowRank];
            high = slopes[highRank];
        }
        else
        {
            var tt = t.ToArray();
            var xx = x.ToArray();
            slope = pairs % 2 == 1 ? OrderStatistic(tt, xx, pairs / 2) : 0.5 * (OrderStatistic(tt, xx, pairs / 2 - 1) + OrderStatistic(tt, xx, pairs / 2));
            low = OrderStatistic(tt, xx, lowRank);
            high = OrderStatistic(tt, xx, highRank);
        }
        // intercept as scipy: median(x) − slope · median(t)
        double intercept = Median(x) - slope * Median(t);
        return new Estimate(slope, low, high, intercept);
    }

    static double Median(ReadOnlySpan<double> v)
    {
        var s = v.ToArray();
        Array.Sort(s);
        return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[s.Length / 2 - 1] + s[s.Length / 2]);
    }

    /// <summary>The rank-th (0-based) smallest pairwise slope, t strictly increasing.</summary>
    static double OrderStatistic(double[] t, double[] x, long rank)
    {
        double lo = double.MaxValue, hi = double.MinValue;
        for (int i = 1; i < t.Length; i++)
        {
            double s = (x[i] - x[i - 1]) / (t[i] - t[i - 1]);
            lo = Math.Min(lo, s);
            hi = Math.Max(hi, s);
        }
        // every pairwise slope is a weighted mean of consecutive slopes, so it lies in [lo, hi]
        for (int iteration = 0; iteration < 200 && hi - lo > 1e-12 * Math.Max(Math.Abs(lo), Math.Abs(hi)); iteration++)
        {
            double mid = 0.5 * (lo + hi);
            if (CountBelowOrEqual(t, x, mid) > rank) hi = mid; else lo = mid;
        }
        return 0.5 * (lo + hi);
    }

    /// <summary>Pairs i &lt; j with slope ≤ s: those with x_j − s t_j ≤ x_i − s t_i, i.e. the non-increasing pairs of y = x − s t.</summary>
    static long CountBelowOrEqual(double[] t, double[] x, double s)
    {
        var y = new double[t.Length];
        for (int i = 0; i < y.Length; i++) y[i] = -(x[i] - s * t[i]);
        // pairs i < j with y_j ≥ y_i (y negated), counted by merge sort
        return CountNonDecreasingPairs(y, new double[y.Length], 0, y.Length);
    }

    static long CountNonDecreasingPairs(double[] a, double[] scratch, int from, int to)
    {
        if (to - from < 2) return 0;
        int mid = (from + to) / 2;
        long count = CountNonDecreasingPairs(a, scratch, from, mid) + CountNonDecreasingPairs(a, scratch, mid, to);
        int i = from, j = mid, k = from;
        while (i < mid && j < to)
        {
            if (a[i] <= a[j]) { count += to - j; scratch[k++] = a[i++]; }
            else scratch[k++] = a[j++];
        }
        while (i < mid) scratch[k++] = a[i++];
        while (j < to) scratch[k++] = a[j++];
        Array.Copy(scratch, from, a, from, to - from);
        return count;
    }
}
