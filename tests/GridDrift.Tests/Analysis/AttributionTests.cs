using System.Text.Json;
using GridDrift.Analysis;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Analysis;

/// <summary>
/// Attribution: the ridge weights against numpy.linalg.solve of the same normal equations
/// (Interop/scripts/ridge_reference.py); the Shapley values of the linear model against a
/// brute-force enumeration of all coalitions (Shapley 1953, with absent regions at their means)
/// and the efficiency property Σφ = f(x) − E[f(X)]; and `griddrift attribute` ranking first the
/// two regions that drive an invented target.
/// </summary>
public class AttributionTests
{
    static (double[,] X, double[] Y) Make(int n, int p, int seed)
    {
        var rng = new Random(seed);
        var x = new double[n, p];
        var y = new double[n];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < p; j++) x[i, j] = 10 * j + (j + 1) * TrendTests.Normal(rng);
            y[i] = 3 + 0.8 * x[i, 0] - 0.5 * x[i, 2] + 0.1 * x[i, p - 1] + 0.3 * TrendTests.Normal(rng);
        }
        return (x, y);
    }

    [InteropFact(Needs.PythonScipy)]
    public void Ridge_weights_equal_numpy_on_the_same_normal_equations()
    {
        var (x, y) = Make(120, 5, 3);
        var model = Ridge.Fit(x, y);
        var rows = Enumerable.Range(0, 120).Select(i => Enumerable.Range(0, 5).Select(j => x[i, j]).ToArray()).ToArray();
        var reference = JsonDocument.Parse(ExternalTools.RunPythonWithInput("ridge_reference.py", JsonSerializer.Serialize(new { x = rows, y, lambda = model.Lambda }))).RootElement;
        var w = reference.GetProperty("w").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int j = 0; j < 5; j++) Assert.True(Math.Abs(w[j] - model.Weights[j]) < 1e-9, $"w{j}: numpy {w[j]:R}, ours {model.Weights[j]:R}");
        Assert.Contains(model.Lambda, Ridge.LambdaGrid);
    }

    [Fact]
    public void Linear_Shapley_values_equal_the_enumeration_of_all_coalitions_and_sum_to_the_prediction_gap()
    {
        const int p = 7;
        var (x, y) = Make(80, p, 5);
        var model = Ridge.Fit(x, y);
        var mean = Enumerable.Range(0, p).Select(j => Enumerable.Range(0, 80).Average(i => x[i, j])).ToArray();
        var probe = new double[1, p];
        double Value(int row, int coalition)
        {
            for (int j = 0; j < p; j++) probe[0, j] = (coalition >> j & 1) == 1 ? x[row, j] : mean[j];
            return model.Predict(probe, 0);
        }
        var phi = new double[p];
        foreach (int row in new[] { 0, 17, 55 })
        {
            model.Shapley(x, row, phi);
            for (int j = 0; j < p; j++)
            {
                double exact = 0;
                for (int s = 0; s < 1 << p; s++)
                {
                    if ((s >> j & 1) == 1) continue;
                    int size = System.Numerics.BitOperations.PopCount((uint)s);
                    double weight = Factorial(size) * Factorial(p - size - 1) / Factorial(p);
                    exact += weight * (Value(row, s | 1 << j) - Value(row, s));
                }
                Assert.True(Math.Abs(exact - phi[j]) < 1e-9, $"row {row}, region {j}: enumeration {exact:R}, closed form {phi[j]:R}");
            }
            double gap = model.Predict(x, row) - Value(row, 0);
            Assert.True(Math.Abs(phi.Sum() - gap) < 1e-9, $"efficiency: Σφ = {phi.Sum():R}, f(x) − E f = {gap:R}");
        }
    }

    static double Factorial(int k) => k <= 1 ? 1 : k * Factorial(k - 1);

    [Fact]
    public void Attribute_ranks_first_the_two_regions_that_drive_the_target()
    {
        using var dir = new TempFolder();
        string path = dir.File("sim.nc");
        string[] regions = ["global", "tropics", "east_box", "west_box", "midlat", "polar_cap"];
        WriteSeries(path, regions, seed: 12);
        var outcome = CliRun.Run("attribute", path, "--target", "global", "--quantity", "ssim", "--periods", "2031/2032,2034/2036",
            "--profiles", "east_box", "--out", dir.File("att.parquet"), "--json", "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var json = JsonDocument.Parse(outcome.Stdout).RootElement;
        var leaders = json.GetProperty("ranking").EnumerateArray().Take(2).Select(r => r.GetProperty("region").GetString()!).Order().ToArray();
        Assert.Equal(["east_box", "polar_cap"], leaders);
        var changes = json.GetProperty("rank_changes").EnumerateArray().ToDictionary(c => c.GetProperty("region").GetString()!, c => c.GetProperty("rank_second").GetInt32());
        Assert.True(changes["east_box"] <= 2 && changes["polar_cap"] <= 2, "after the change the two regions lead");
        Assert.True(File.Exists(dir.File("att_shapley.parquet")) && File.Exists(dir.File("att_ranks.parquet")) && File.Exists(dir.File("att_profiles.parquet")));
    }

    /// <summary>Daily ssim-like series 2031–2036: global = mean of the five others + noise; east_box and polar_cap vary three times more from 2033-07-01.</summary>
    static void WriteSeries(string path, string[] regions, int seed)
    {
        var rng = new Random(seed);
        using var w = ClassicWriter.Create(path);
        var time = w.AddDimension("time", 0, unlimited: true);
        var region = w.AddDimension("region", regions.Length);
        var strlen = w.AddDimension("name_strlen", 12);
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "days since 2031-01-01"), NcAttribute.Text("calendar", "standard")]);
        var names = w.AddVariable("region_name", NcType.Char, [region, strlen]);
        var v = w.AddVariable("ssim", NcType.Double, [time, region], [NcAttribute.Text("units", "1"), NcAttribute.Text("coordinates", "region_name")]);
        w.EndDefinitions();
        var bytes = new byte[regions.Length * 12];
        for (int r = 0; r < regions.Length; r++) System.Text.Encoding.ASCII.GetBytes(regions[r]).CopyTo(bytes, r * 12);
        w.Write<byte>(names, bytes);
        int change = 365 + 366 + 181; // 2033-07-01
        var row = new double[regions.Length];
        for (int d = 0; d < 6 * 365 + 1; d++)
        {
            double total = 0;
            for (int r = 1; r < regions.Length; r++)
            {
                double spread = d >= change && (regions[r] is "east_box" or "polar_cap") ? 0.03 : 0.01;
                row[r] = 0.9 + spread * TrendTests.Normal(rng);
                total += row[r];
            }
            row[0] = total / (regions.Length - 1) + 0.001 * TrendTests.Normal(rng);
            w.WriteRecord<double>(vt, d, [d]);
            w.WriteRecord<double>(v, d, row);
        }
        w.Commit();
    }
}
