using System.Collections.Concurrent;

namespace GridDrift.Analysis;

/// <summary>
/// The PELT penalty that gives a series of independent noise (a whitened series) no change point
/// at the rate α: the (1 − α/2) quantile of the largest single-split cost reduction, over the
/// admissible splits, of Gaussian white noise of the same length — found by simulation (999
/// series, fixed seed) and cached by length. Half of α, because segmentations with two and more
/// changes fire about as often again as the single split (measured: 6.5–9.5 % of unchanged series
/// got a change with the (1 − α) quantile). With this β, "PELT found a change" is a test at level
/// α against "no change", whatever the length; the BIC's p ln n is not (it is conservative for
/// short series and says nothing of the rate). The penalty path of CROPS (Haynes, Eckley &amp;
/// Fearnhead 2017, JCGS 26: 134) shows the same trade-off for every β; here one β is chosen, for a stated rate.
/// </summary>
internal static class PeltPenalty
{
    const int Replicates = 999;
    static readonly ConcurrentDictionary<(int, SegmentCost, int, double), double> Cache = new();

    public static double For(int length, SegmentCost cost, int minSegment, double alpha)
    {
        // lengths within 1 % share a penalty: the quantile moves by far less than its simulation error over that range
        int bucket = length < 200 ? length : (int)(Math.Round(length / Math.Pow(10, Math.Floor(Math.Log10(length)) - 2)) * Math.Pow(10, Math.Floor(Math.Log10(length)) - 2));
        return Cache.GetOrAdd((bucket, cost, minSegment, alpha), key => Simulate(key.Item1, key.Item2, key.Item3, key.Item4));
    }

    static double Simulate(int n, SegmentCost cost, int minSegment, double alpha)
    {
        minSegment = Math.Max(cost == SegmentCost.MeanAndVariance ? 2 : 1, minSegment);
        if (n < 2 * minSegment) return double.PositiveInfinity;
        var maxima = new double[Replicates];
        Parallel.For(0, Replicates, () => (new double[n], new double[n + 1], new double[n + 1]), (r, _, buffers) =>
        {
            var (x, s1, s2) = buffers;
            var rng = new Random(7919 * (r + 1) + n);
            Gaussian.Fill(rng, x);
            maxima[r] = LargestSplitGain(x, cost, minSegment, s1, s2);
            return buffers;
        }, _ => { });
        Array.Sort(maxima);
        return maxima[Math.Min(Replicates - 1, (int)Math.Ceiling((1 - alpha / 2) * (Replicates + 1)) - 1)];
    }

    /// <summary>The largest drop of PELT's cost from one segment to two over the admissible splits, as <see cref="Pelt.Detect"/> scores it.</summary>
    public static double LargestSplitGain(ReadOnlySpan<double> x, SegmentCost cost, int minSegment, double[] s1, double[] s2)
    {
        int n = x.Length;
        for (int i = 0; i < n; i++)
        {
            s1[i + 1] = s1[i] + x[i];
            s2[i + 1] = s2[i] + x[i] * x[i];
        }
        double total = s2[n] - s1[n] * s1[n] / n, sigma2 = total / n, best = 0;
        for (int t = minSegment; t <= n - minSegment; t++)
        {
            double a = s1[t], b = s1[n] - s1[t];
            double gain;
            if (cost == SegmentCost.Mean)
            {
                double d = a / t - b / (n - t);
                gain = (double)t * (n - t) / n * d * d / sigma2;
            }
            else
            {
                double ss1 = Math.Max(s2[t] - a * a / t, 1e-300), ss2 = Math.Max(s2[n] - s2[t] - b * b / (n - t), 1e-300);
                gain = n * Math.Log(total / n) - t * Math.Log(ss1 / t) - (n - t) * Math.Log(ss2 / (n - t));
            }
            if (gain > best) best = gain;
        }
        return best;
    }
}
