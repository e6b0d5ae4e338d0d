using System.Text.Json;
using GridDrift.Analysis;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// The outlier detectors: generalized ESD on the worked example of the NIST/SEMATECH
/// e-Handbook of Statistical Methods (§1.3.5.17.3, Rosner's 54 values; data, statistics and
/// critical values from memory of that page): exactly three outliers; robust z, Tukey fences
/// and Hampel against numpy (Interop/scripts/detectors_reference.py); the seasonal residual
/// finds spikes a seasonal cycle hides; its harmonic model equals numpy's least squares
/// (Interop/scripts/harmonic_reference.py).
/// </summary>
public class OutlierTests
{
    static readonly double[] Rosner =
    [
        -0.25, 0.68, 0.94, 1.15, 1.20, 1.26, 1.26, 1.34, 1.38, 1.43, 1.49, 1.49, 1.55, 1.56,
        1.58, 1.65, 1.69, 1.70, 1.76, 1.77, 1.81, 1.91, 1.94, 1.96, 1.99, 2.06, 2.09, 2.10,
        2.14, 2.15, 2.23, 2.24, 2.26, 2.35, 2.37, 2.40, 2.47, 2.54, 2.62, 2.64, 2.90, 2.92,
        2.92, 2.93, 3.21, 3.26, 3.30, 3.59, 3.68, 4.30, 4.64, 5.34, 5.42, 6.01,
    ];

    [Fact]
    public void Generalized_ESD_finds_exactly_three_outliers_in_Rosners_data()
    {
        var (flags, r, lambda, outliers) = Outliers.GeneralizedEsdSteps(Rosner, maxOutliers: 10, alpha: 0.05);
        Assert.Equal(3, outliers);
        Assert.Equal([5.34, 5.42, 6.01], Rosner.Where((_, i) => flags[i].Flagged).Order());
        double[] nistR = [3.118, 2.942, 3.179, 2.810, 2.815, 2.848, 2.279, 2.310, 2.101, 2.067];
        double[] nistLambda = [3.158, 3.151, 3.143, 3.136, 3.128, 3.120, 3.111, 3.103, 3.094, 3.085];
        for (int i = 0; i < 10; i++)
        {
            Assert.True(Math.Abs(r[i] - nistR[i]) < 1.5e-3, $"R{i + 1}: NIST {nistR[i]}, ours {r[i]:0.0000}");
            Assert.True(Math.Abs(lambda[i] - nistLambda[i]) < 1.5e-3, $"λ{i + 1}: NIST {nistLambda[i]}, ours {lambda[i]:0.0000}");
        }
    }

    [InteropFact(Needs.PythonScipy)]
    public void Robust_z_Tukey_and_Hampel_equal_numpy()
    {
        var rng = new Random(4);
        var x = Enumerable.Range(0, 300).Select(i => TrendTests.Normal(rng) + (i % 37 == 0 ? 6 : 0)).ToArray();
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("detectors_reference.py", JsonSerializer.Serialize(new { x }))).RootElement;
        Compare(reference, "robust_z", Outliers.RobustZ(x));
        Compare(reference, "tukey", Outliers.TukeyFences(x));
        Compare(reference, "hampel", Outliers.Hampel(x));
    }

    static void Compare(JsonElement reference, string name, Flag[] ours)
    {
        var scores = reference.GetProperty(name).EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int i = 0; i < scores.Length; i++)
        {
            double o = double.IsPositiveInfinity(ours[i].Score) ? 1e308 : ours[i].Score;
            Assert.True(Math.Abs(o - scores[i]) <= 1e-9 * Math.Max(1, Math.Abs(scores[i])), $"{name}[{i}]: numpy {scores[i]:R}, ours {o:R}");
        }
        Assert.Equal(reference.GetProperty(name + "_flags").EnumerateArray().Select(e => e.GetInt32()), Enumerable.Range(0, ours.Length).Where(i => ours[i].Flagged));
    }

    [InteropFact(Needs.PythonScipy)]
    public void Seasonal_model_residuals_equal_numpy_least_squares()
    {
        var rng = new Random(21);
        var days = Enumerable.Range(0, 1500).Select(d => d * 0.75).ToArray();
        var x = days.Select(d => 5 + 0.001 * d + 3 * Math.Sin(2 * Math.PI * d / 365.2425) + TrendTests.Normal(rng)).ToArray();
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("harmonic_reference.py", JsonSerializer.Serialize(new { days, x }))).RootElement;
        var expected = reference.GetProperty("residuals").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        var ours = SeasonalModel.Residuals(days, x);
        for (int i = 0; i < x.Length; i++) Assert.True(Math.Abs(expected[i] - ours[i]) < 1e-9, $"residual {i}: numpy {expected[i]:R}, ours {ours[i]:R}");
    }

    [Fact]
    public void The_seasonal_residual_finds_spikes_that_the_annual_cycle_hides()
    {
        // daily values with a ±10 annual cycle and noise σ = 0.5; spikes of +3 in winter troughs stay inside the raw range
        var rng = new Random(9);
        var days = Enumerable.Range(0, 3 * 365).Select(d => (double)d).ToArray();
        var spikes = new[] { 0, 365, 730 }.Select(d => d + 5).ToArray();
        var x = days.Select(d => 10 * Math.Cos(2 * Math.PI * d / 365.2425) + 0.5 * TrendTests.Normal(rng)).ToArray();
        foreach (int s in spikes) x[s] -= 4; // troughs are at mid-year: day 5 is near the crest, so push down into the range
        var raw = Outliers.RobustZ(x);
        var seasonal = Outliers.SeasonalResidual(days, x);
        Assert.DoesNotContain(spikes, s => raw[s].Flagged);
        Assert.All(spikes, s => Assert.True(seasonal[s].Flagged, $"day {s}: residual z {seasonal[s].Score:0.0}"));
        Assert.True(seasonal.Count(f => f.Flagged) <= spikes.Length + 3, "few false flags");
    }
}
