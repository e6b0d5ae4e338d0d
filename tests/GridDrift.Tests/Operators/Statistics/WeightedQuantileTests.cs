using System.Globalization;
using GridDrift.Operators.Statistics;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Statistics;

/// <summary>
/// With equal weights the area-weighted quantile is Hyndman & Fan (1996) definition 5; witness:
/// numpy.percentile(method="hazen") (Debian python3-numpy), on small inputs (sorted whole) and
/// large ones (the histogram path).
/// </summary>
public class WeightedQuantileTests
{
    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData(7)]
    [InlineData(1000)]
    [InlineData(50_000)]
    public void Equal_weights_give_numpy_hazen_percentiles(int n)
    {
        var rng = new Random(n);
        // distinct values: with ties the definition makes one atom of them, which numpy's Hazen percentile does not
        var values = Enumerable.Range(0, n).Select(_ => (float)(200 + 60 * rng.NextDouble() * rng.NextDouble())).Distinct().ToArray();
        n = values.Length;
        var expected = ExternalTools.RunPythonWithInput("hazen_percentiles.py", string.Join(" ", values.Select(v => ((double)v).ToString("R", CultureInfo.InvariantCulture))))
            .Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(t => double.Parse(t, CultureInfo.InvariantCulture)).ToArray();

        var results = new double[3];
        WeightedQuantile.Evaluate(values, Enumerable.Repeat(1.0, n).ToArray(), [0.1, 0.5, 0.9], results);
        for (int q = 0; q < 3; q++) Assert.Equal(expected[q], results[q], 9);
    }

    [Fact]
    public void A_heavier_value_pulls_the_median_toward_itself()
    {
        // Two values: with weights 3 and 1 the mid-weights sit at 3/8 and 7/8, so the median
        // interpolates 1/4 of the way from 10 to 20 (definition above; worked by hand).
        var results = new double[1];
        WeightedQuantile.Evaluate([10f, 20f], [3.0, 1.0], [0.5], results);
        Assert.Equal(12.5, results[0], 12);
    }

    /// <summary>
    /// R5: tied values are one atom. A packed int16 field with many ties, stored south-to-north and
    /// north-to-south, gives the same p10, p50 and p90 through `griddrift stats`, equal to an
    /// independent numpy implementation of the definition (Interop/scripts/tied_quantiles.py,
    /// exact cell areas as weights).
    /// </summary>
    [InteropFact(Needs.PythonNetcdf)]
    public void Tied_values_give_quantiles_that_do_not_depend_on_storage_order()
    {
        using var dir = new TempFolder();
        var expected = System.Text.Json.JsonDocument.Parse(ExternalTools.RunPython("tied_quantiles.py", dir.Path)).RootElement;
        foreach (var name in new[] { "sn", "ns" })
        {
            var outcome = CliRun.Run("stats", dir.File(name + ".nc"), "--var", "tb", "--regions", "global", "--stat", "p10,p50,p90", "--out", dir.File(name + "_s.nc"), "--quiet");
            Assert.True(outcome.ExitCode == 0, outcome.Stderr);
            using var reader = GridDrift.Formats.DatasetFiles.Open(dir.File(name + "_s.nc"));
            foreach (var q in new[] { "p10", "p50", "p90" })
            {
                var got = GridDrift.Formats.DatasetReaderExtensions.ReadAllDoubles(reader, GridDrift.Formats.DatasetReaderExtensions.RequireVariable(reader, q));
                var want = expected.GetProperty(q).EnumerateArray().Select(e => e.GetDouble()).ToArray();
                for (int k = 0; k < want.Length; k++) Assert.True(Math.Abs(want[k] - got[k]) < 1e-4, $"{name} {q}[{k}]: numpy {want[k]}, GridDrift {got[k]}");
            }
        }
    }
}
