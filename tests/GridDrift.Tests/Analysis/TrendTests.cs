using System.Text.Json;
using GridDrift.Analysis;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// Mann–Kendall and Sen's slope against scipy.stats.kendalltau and theilslopes and the textbook
/// variance and normal p (numpy) (Interop/scripts/trend_reference.py), on series with trends,
/// ties, autocorrelation and uneven times.
/// </summary>
public class TrendTests
{
    public static TheoryData<int, double, double, bool> Series() => new()
    {
        { 60, 0.02, 0.0, false },   // trend, no ties
        { 120, 0.0, 0.6, false },   // no trend, AR(1) 0.6
        { 200, -0.01, 0.4, true },  // trend, autocorrelated, rounded values (ties)
        { 90, 0.05, 0.0, true },
        { 700, 0.002, 0.5, false }, // long enough for the FFT autocorrelation
    };

    static (double[] T, double[] X) Make(int n, double slope, double ar, bool ties, int seed)
    {
        var rng = new Random(seed);
        var t = new double[n];
        var x = new double[n];
        double e = 0, time = 0;
        for (int i = 0; i < n; i++)
        {
            time += 1 + (i % 3 == 0 ? 0.5 : 0); // uneven steps (days)
            e = ar * e + Normal(rng);
            t[i] = time;
            x[i] = slope * time + e;
            if (ties) x[i] = Math.Round(x[i] * 2) / 2;
        }
        return (t, x);
    }

    [InteropTheory(Needs.PythonStatsmodels)]
    [MemberData(nameof(Series))]
    public void Mann_Kendall_and_Sen_equal_the_references(int n, double slope, double ar, bool ties)
    {
        var (t, x) = Make(n, slope, ar, ties, seed: n);
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("trend_reference.py", JsonSerializer.Serialize(new { t, x }))).RootElement;
        var mk = MannKendall.Test(x);
        Assert.Equal(reference.GetProperty("s_bruteforce").GetDouble(), mk.S);
        if (!ties) Assert.Equal(reference.GetProperty("tau").GetDouble() * n * (n - 1) / 2, mk.S, 6); // S = tau n(n-1)/2 without ties
        Close(reference.GetProperty("var_s").GetDouble(), mk.VarS, 1e-12, "Var(S)");
        Close(reference.GetProperty("z").GetDouble(), mk.Z, 1e-12, "Z");
        Close(reference.GetProperty("p").GetDouble(), mk.P, 1e-9, "p");
        var sen = SenSlope.Compute(t, x);
        Close(reference.GetProperty("sen_slope").GetDouble(), sen.Slope, 1e-12, "Sen slope");
        Close(reference.GetProperty("sen_intercept").GetDouble(), sen.Intercept, 1e-12, "intercept");
        Close(reference.GetProperty("sen_low").GetDouble(), sen.Low, 1e-12, "lower bound");
        Close(reference.GetProperty("sen_high").GetDouble(), sen.High, 1e-12, "upper bound");
    }

    [Fact]
    public void Kendall_S_in_n_log_n_equals_the_double_sum_definition()
    {
        // Mann (1945): S = Σ_{i<j} sign(x_j − x_i), here with many ties
        var rng = new Random(5);
        var x = Enumerable.Range(0, 500).Select(_ => (double)rng.Next(0, 20)).ToArray();
        long s = 0;
        for (int i = 0; i < x.Length; i++)
            for (int j = i + 1; j < x.Length; j++) s += Math.Sign(x[j] - x[i]);
        Assert.Equal(s, Ranks.KendallS(x));
    }

    [Fact]
    public void Sen_slope_by_bisection_agrees_with_enumeration_for_long_series()
    {
        // 3,000 values: 4.5 million pairs, past the enumeration limit; compared with a brute-force median of all pairs
        var rng = new Random(8);
        int n = 3000;
        var t = Enumerable.Range(0, n).Select(i => i * 0.125).ToArray();
        var x = t.Select(v => 0.3 * v + 5 * Normal(rng)).ToArray();
        var slopes = new List<double>();
        for (int i = 0; i < n; i++)
            for (int j = i + 1; j < n; j++) slopes.Add((x[j] - x[i]) / (t[j] - t[i]));
        slopes.Sort();
        long pairs = slopes.Count;
        double median = 0.5 * (slopes[(int)(pairs / 2 - 1)] + slopes[(int)(pairs / 2)]);
        var sen = SenSlope.Compute(t, x);
        Assert.True(Math.Abs(sen.Slope - median) <= 1e-9 * Math.Abs(median), $"bisection {sen.Slope:R}, enumeration {median:R}");
    }

    static void Close(double expected, double actual, double relative, string what) =>
        Assert.True(Math.Abs(expected - actual) <= relative * Math.Max(1, Math.Abs(expected)), $"{what}: reference {expected:R}, ours {actual:R}");

    internal static double Normal(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
