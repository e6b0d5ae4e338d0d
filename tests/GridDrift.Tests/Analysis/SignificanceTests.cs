using System.Text.Json;
using GridDrift.Analysis;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// The pieces every reported p- and q-value rests on, against scipy and statsmodels
/// (Interop/scripts/significance_reference.py): normal tails without cancellation, their log10
/// where they underflow, Benjamini–Hochberg q-values, and the Yule–Walker AR of the sieve.
/// </summary>
public class SignificanceTests
{
    [InteropFact(Needs.PythonStatsmodels)]
    public void Tails_q_values_and_the_autoregression_equal_scipy_and_statsmodels()
    {
        double[] z = [0.3, 1.96, 5, 8.5, 14, 30, 39, 45];
        var rng = new Random(4);
        // p-values with ties and a spread of sizes, as a run's tests give them
        double[] p = [0.001, 0.02, 0.02, 0.5, 0.04, 1e-12, 0.9, 0.03, 0.049, 0.2];
        var x = new double[3000];
        double a = 0, b = 0;
        for (int i = 0; i < x.Length; i++)
        {
            double v = 0.5 * a + 0.3 * b + TrendTests.Normal(rng);
            b = a; a = v; x[i] = v + 10;
        }
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("significance_reference.py", JsonSerializer.Serialize(new { z, p, x, order = 3 }))).RootElement;
        var tails = reference.GetProperty("tails").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        var log10 = reference.GetProperty("log10").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int i = 0; i < z.Length; i++)
        {
            if (tails[i] > 0) Assert.True(Math.Abs(PValues.TwoSidedNormal(z[i]) - tails[i]) <= 1e-12 * tails[i], $"z = {z[i]}: {PValues.TwoSidedNormal(z[i])} vs scipy {tails[i]}");
            Assert.True(Math.Abs(PValues.Log10TwoSidedNormal(z[i]) - log10[i]) <= 1e-6 * Math.Abs(log10[i]) + 1e-12, $"z = {z[i]}: log10 {PValues.Log10TwoSidedNormal(z[i])} vs scipy {log10[i]}");
        }
        var q = FalseDiscovery.QValues(p);
        var expected = reference.GetProperty("q").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int i = 0; i < p.Length; i++) Assert.Equal(expected[i], q[i], 12);

        var ar = Autoregression.OfOrder(x, 3);
        var rho = reference.GetProperty("ar").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int k = 0; k < 3; k++) Assert.Equal(rho[k], ar.Coefficients[k], 10);
        Assert.Equal(reference.GetProperty("sigma").GetDouble(), Math.Sqrt(ar.InnovationVariance), 10);
    }

    /// <summary>z = 14 is 1 − Φ(z) = 0 in double precision (the old form printed p = 0); the value is 1.6e-44 (scipy's norm.sf, from memory).</summary>
    [Fact]
    public void Small_p_values_never_print_as_zero()
    {
        Assert.True(PValues.TwoSidedNormal(14) is > 1e-45 and < 1e-43);
        Assert.Equal("< 1e-300", PValues.Format(0));
        Assert.Equal("< 1e-300", PValues.Format(1e-320));
        Assert.Equal("3.2E-44", PValues.Format(3.2e-44));
        Assert.Equal(PValues.Floor, PValues.Stored(0));
        Assert.True(double.IsFinite(Pettitt.Log10P(1e9, 20_000)), "Pettitt's log10 p stays finite where p underflows");
    }
}
