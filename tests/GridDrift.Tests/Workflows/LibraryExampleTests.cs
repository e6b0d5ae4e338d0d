using System.Text.Json;
using GridDrift;
using GridDrift.Operators.Climatology;
using GridDrift.Outputs.Series;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Workflows;

/// <summary>
/// The example of docs/library.md, run as written on a record made by python netCDF4
/// (Interop/scripts/make_stats_fixture.py), its results checked against independent numpy
/// computations (stats_reference.py, monthly_means_reference.py) and its table read back by DuckDB.
/// </summary>
public class LibraryExampleTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void The_documented_example_runs_and_its_results_equal_numpy()
    {
        using var dir = new TempFolder();
        string path = dir.File("record.nc");
        ExternalTools.RunPython("make_stats_fixture.py", path, "NETCDF4");
        string folder = dir.Path;

        // example:begin
        using var record = GridRecord.Open([path], "tcwv");
        var regions = record.Regions("global", "bands:30");

        var stats = record.RegionStatistics(regions, [RegionStatistic.Mean, RegionStatistic.P90], minValid: 0.5);
        double[] globalMean = stats.Of("global", "mean");

        var similarity = record.Similarity(regions, [SimilarityMetric.Ssim, SimilarityMetric.Corr], range: "0:80");
        double[] globalSsim = similarity.Of("global", "ssim");

        using var climatology = record.Climatology(ClimatologyKind.Month);
        var (marchMean, marchStd, marchCount) = climatology.Slot(2); // slots count from January = 0

        stats.WriteNetCdf(Path.Combine(folder, "stats.nc"));
        stats.WriteTable(Path.Combine(folder, "stats.parquet"));
        // example:end

        // area-weighted means: the independent numpy computation of the stats checks
        var reference = JsonDocument.Parse(ExternalTools.RunPython("stats_reference.py", path, "tcwv", "30",
            GridDrift.Grids.Sphere.MeanEarthRadius.ToString("R", System.Globalization.CultureInfo.InvariantCulture))).RootElement;
        var expected = reference.GetProperty("global").GetProperty("mean").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        Assert.Equal(expected.Length, globalMean.Length);
        for (int t = 0; t < expected.Length; t++) Assert.True(Math.Abs(globalMean[t] - expected[t]) <= 1e-9 * Math.Abs(expected[t]), $"global mean at {t}");

        // five daily frames from 2031-02-27 (the fixture's construction): four frame-to-frame pairs
        Assert.Equal(4, globalSsim.Length);
        Assert.All(globalSsim, s => Assert.InRange(s, -1, 1));

        // the March slot: numpy's nanmean of the March frames, cell by cell
        var months = JsonDocument.Parse(ExternalTools.RunPython("monthly_means_reference.py", path, "tcwv")).RootElement;
        var march = months.GetProperty("3").EnumerateArray().ToArray();
        Assert.Equal(march.Length, marchMean.Length);
        for (int c = 0; c < march.Length; c++)
        {
            if (march[c].ValueKind == JsonValueKind.Null) { Assert.True(float.IsNaN(marchMean[c])); continue; }
            Assert.True(Math.Abs(marchMean[c] - march[c].GetDouble()) <= 1e-5 * Math.Abs(march[c].GetDouble()), $"March mean at cell {c}");
        }
        Assert.Equal(3, marchCount.Max()); // 1, 2 and 3 March
        Assert.True(marchStd.Where(float.IsFinite).All(s => s >= 0));

        // the table, read by DuckDB: one row per time, region and quantity, and the same global means
        using var duck = DuckDb.Open();
        string table = Path.Combine(folder, "stats.parquet").Replace("'", "''");
        Assert.Equal(5L * 7 * 2, Convert.ToInt64(DuckDb.Query(duck, $"SELECT count(*) FROM '{table}'")[0][0]));
        var fromTable = DuckDb.Query(duck, $"SELECT value FROM '{table}' WHERE region = 'global' AND quantity = 'mean' ORDER BY time").Select(r => Convert.ToDouble(r[0])).ToArray();
        for (int t = 0; t < expected.Length; t++) Assert.True(Math.Abs(fromTable[t] - expected[t]) <= 1e-9 * Math.Abs(expected[t]), $"table mean at {t}");
        Assert.True(File.Exists(Path.Combine(folder, "stats.nc")));
    }

    [Fact]
    public void The_example_in_the_docs_is_the_one_this_test_runs()
    {
        static string[] Lines(IEnumerable<string> lines) => lines.Select(l => l.Trim()).Where(l => l.Length > 0).ToArray();
        string doc = File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "docs", "library.md"));
        int open = doc.IndexOf("```csharp\n", StringComparison.Ordinal);
        int close = doc.IndexOf("```", open + 10, StringComparison.Ordinal);
        var documented = Lines(doc[(open + 10)..close].Split('\n')).Where(l => !(l.StartsWith("using ", StringComparison.Ordinal) && !l.Contains('='))
            && !l.StartsWith("string path", StringComparison.Ordinal) && !l.StartsWith("string folder", StringComparison.Ordinal)).ToArray();
        string source = File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "docs", "LibraryExampleTests.cs.txt"));
        int begin = source.IndexOf("// example:begin", StringComparison.Ordinal), end = source.IndexOf("// example:end", StringComparison.Ordinal);
        var tested = Lines(source[(begin + 16)..end].Split('\n'));
        Assert.Equal(tested, documented);
        // the page's using directives are ones this file compiles with
        var usings = Lines(source.Split('\n')).Where(l => l.StartsWith("using ", StringComparison.Ordinal) && l.EndsWith(';') && !l.Contains('=')).ToHashSet();
        var documentedUsings = Lines(doc[(open + 10)..close].Split('\n')).Where(l => l.StartsWith("using ", StringComparison.Ordinal) && !l.Contains('=')).ToArray();
        Assert.NotEmpty(documentedUsings);
        Assert.All(documentedUsings, u => Assert.Contains(u, usings));
    }
}
