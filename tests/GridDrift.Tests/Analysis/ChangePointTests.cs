using GridDrift.Analysis;
using Xunit.Abstractions;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// Pettitt and PELT on generated series with change points at known places: hit rates over
/// many seeds; Pettitt's rank form against its double-sum definition (Pettitt 1979, eq. 2.1);
/// PELT's segmentation against exhaustive optimal partitioning with the same cost and penalty
/// (Killick et al. 2012 prove PELT exact: both must agree).
/// </summary>
public class ChangePointTests
{
    readonly ITestOutputHelper _output;
    public ChangePointTests(ITestOutputHelper output) => _output = output;

    [Fact]
    public void Pettitt_rank_form_equals_the_double_sum_definition()
    {
        var rng = new Random(2);
        var x = Enumerable.Range(0, 80).Select(i => Math.Round(TrendTests.Normal(rng) + (i > 50 ? 1 : 0), 1)).ToArray();
        double best = -1;
        int at = -1;
        for (int t = 0; t < x.Length - 1; t++)
        {
            double u = 0;
            for (int i = 0; i <= t; i++)
                for (int j = t + 1; j < x.Length; j++) u += Math.Sign(x[i] - x[j]);
            if (Math.Abs(u) > best) { best = Math.Abs(u); at = t; }
        }
        var r = Pettitt.Test(x);
        Assert.Equal(best, r.K, 9);
        Assert.Equal(at, r.LastBefore);
        Assert.Equal(Math.Min(1, 2 * Math.Exp(-6 * best * best / (Math.Pow(80, 3) + Math.Pow(80, 2)))), r.P, 12);
    }

    [Fact]
    public void Pettitt_finds_a_one_sigma_shift_within_five_steps_in_most_series()
    {
        int hits = 0, significant = 0, seeds = 300;
        for (int seed = 0; seed < seeds; seed++)
        {
            var rng = new Random(seed);
            var x = Enumerable.Range(0, 200).Select(i => TrendTests.Normal(rng) + (i >= 120 ? 1.0 : 0)).ToArray();
            var r = Pettitt.Test(x);
            if (Math.Abs(r.LastBefore - 119) <= 5) hits++;
            if (r.P < 0.05) significant++;
        }
        _output.WriteLine($"Pettitt: {hits}/{seeds} within ±5 steps, {significant}/{seeds} with p < 0.05");
        Assert.True(hits >= 0.8 * seeds, $"hit rate {hits}/{seeds}");
        Assert.True(significant >= 0.95 * seeds, $"significant {significant}/{seeds}");
    }

    [Theory]
    [InlineData(SegmentCost.Mean)]
    [InlineData(SegmentCost.MeanAndVariance)]
    public void Pelt_equals_exhaustive_optimal_partitioning(SegmentCost cost)
    {
        for (int seed = 0; seed < 20; seed++)
        {
            var rng = new Random(100 + seed);
            var x = Enumerable.Range(0, 150).Select(i => (i < 50 ? 0 : i < 100 ? 1.5 : -0.5) + (cost == SegmentCost.MeanAndVariance && i >= 100 ? 3 : 1) * TrendTests.Normal(rng)).ToArray();
            var pelt = Pelt.Detect(x, cost, minSegment: 5);
            var exact = OptimalPartitioning(x, cost, 5);
            Assert.Equal(exact, pelt);
        }
    }

    [Fact]
    public void Pelt_finds_two_mean_shifts_in_most_series()
    {
        int hits = 0, seeds = 200, extra = 0;
        for (int seed = 0; seed < seeds; seed++)
        {
            var rng = new Random(seed);
            var x = Enumerable.Range(0, 300).Select(i => (i < 100 ? 0 : i < 220 ? 1.5 : 0.3) + TrendTests.Normal(rng)).ToArray();
            var cps = Pelt.Detect(x, SegmentCost.Mean);
            bool first = cps.Any(c => Math.Abs(c - 100) <= 5), second = cps.Any(c => Math.Abs(c - 220) <= 5);
            if (first && second) hits++;
            extra += Math.Max(0, cps.Length - 2);
        }
        _output.WriteLine($"PELT (mean, BIC): both shifts within ±5 in {hits}/{seeds} series; {extra} spurious change points in all");
        Assert.True(hits >= 0.8 * seeds, $"hit rate {hits}/{seeds}");
        Assert.True(extra <= 0.2 * seeds, $"{extra} spurious change points");
    }

    /// <summary>Jackson et al. (2005) optimal partitioning: the O(n²) dynamic programme PELT prunes.</summary>
    static int[] OptimalPartitioning(double[] x, SegmentCost cost, int minSegment)
    {
        int n = x.Length, p = cost == SegmentCost.Mean ? 2 : 3;
        double beta = p * Math.Log(n), sigma2 = Math.Pow(Pelt.RobustNoise(x), 2);
        double total = x.Select(v => v * v).Sum() / n - Math.Pow(x.Average(), 2);
        double Cost(int a, int b)
        {
            var seg = x[a..b];
            double m = seg.Average(), ss = seg.Sum(v => (v - m) * (v - m));
            return cost == SegmentCost.Mean ? ss / sigma2 : seg.Length * Math.Log(Math.Max(ss / seg.Length, Math.Max(1e-12 * total, 1e-300)));
        }
        var f = new double[n + 1];
        var last = new int[n + 1];
        f[0] = -beta;
        for (int t = 1; t <= n; t++)
        {
            f[t] = double.PositiveInfinity;
            last[t] = -1;
            for (int tau = 0; tau <= t - minSegment; tau++)
            {
                if (double.IsPositiveInfinity(f[tau])) continue;
                double v = f[tau] + Cost(tau, t) + beta;
                if (v < f[t]) { f[t] = v; last[t] = tau; }
            }
        }
        var cps = new List<int>();
        for (int t = n; t > 0 && last[t] >= 0; t = last[t]) if (last[t] > 0) cps.Add(last[t]);
        cps.Reverse();
        return cps.ToArray();
    }
}
