using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Pipeline;
using GridDrift.Operators.Statistics;
using GridDrift.Tests.Support;
using GridDrift.Grids;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Statistics;

/// <summary>
/// Area-weighted band and global statistics on files made by python netCDF4 in every format,
/// with missing cells, against an independent numpy computation kept beside this test
/// (Interop/scripts/stats_reference.py): exact overlap areas, NaN-aware weighted moments,
/// extremes, Hazen-position weighted quantiles and valid fractions, to 1e-9 relative.
/// </summary>
public class StatsInteropTests
{
    public static TheoryData<string> Formats() => ["NETCDF3_CLASSIC", "NETCDF3_64BIT_OFFSET", "NETCDF3_64BIT_DATA", "NETCDF4_CLASSIC", "NETCDF4"];

    [InteropTheory(Needs.PythonNetcdf)]
    [MemberData(nameof(Formats))]
    public void Band_and_global_statistics_equal_numpy(string format)
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc");
        ExternalTools.RunPython("make_stats_fixture.py", input, format);
        string output = dir.File("series.nc");
        var summary = StatsStep.Run(new StatsOptions([input], "tcwv", ["global", "bands:30"], RegionStatistics.All, output, MinValid: 0));
        var reference = JsonDocument.Parse(ExternalTools.RunPython("stats_reference.py", input, "tcwv", "30", Summary.Radius)).RootElement;

        using var series = DatasetFiles.Open(output);
        var names = series.ReadText(series.RequireVariable("region_name"));
        var areas = series.ReadAllDoubles(series.RequireVariable("region_area"));
        Assert.Equal(reference.EnumerateObject().Select(p => p.Name), names);
        foreach (var stat in new[] { "mean", "std", "min", "max", "p10", "p50", "p90" })
        {
            var ours = series.ReadAllDoubles(series.RequireVariable(stat)); // (time, region)
            for (int r = 0; r < names.Length; r++)
            {
                var expected = reference.GetProperty(names[r]).GetProperty(stat).EnumerateArray().Select(e => e.GetDouble()).ToArray();
                for (int t = 0; t < expected.Length; t++)
                    AssertRelative(expected[t], ours[t * names.Length + r], 1e-9, $"{stat} of {names[r]} at frame {t} ({format})");
            }
        }
        var valid = series.ReadAllDoubles(series.RequireVariable("valid_fraction"));
        for (int r = 0; r < names.Length; r++)
        {
            var region = reference.GetProperty(names[r]);
            AssertRelative(region.GetProperty("area")[0].GetDouble(), areas[r], 1e-12, $"area of {names[r]}");
            var expected = region.GetProperty("valid").EnumerateArray().Select(e => e.GetDouble()).ToArray();
            for (int t = 0; t < expected.Length; t++) AssertRelative(expected[t], valid[t * names.Length + r], 1e-9, $"valid fraction of {names[r]} at {t}");
        }
        Assert.Equal(5, summary.Frames);
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void The_general_index_path_equals_numpy_as_the_box_fast_path_does()
    {
        // StatsStep takes the separable fast path for boxes; curvilinear grids and polygons take the
        // per-region index path. Check that path on the same fixture against the same numpy reference.
        using var dir = new TempFolder();
        string input = dir.File("record.nc");
        ExternalTools.RunPython("make_stats_fixture.py", input, "NETCDF3_64BIT_OFFSET");
        var reference = JsonDocument.Parse(ExternalTools.RunPython("stats_reference.py", input, "tcwv", "30", Summary.Radius)).RootElement;
        using var source = GridDrift.Frames.FrameSource.Open([input], "tcwv");
        var grid = GridDrift.Grids.GridReader.Read(source.Template, source.Axes);
        var shapes = GridDrift.Regions.RegionSpecs.Parse(["global", "bands:30"]);
        var mask = GridDrift.Regions.RegionMaskBuilder.Build(grid, shapes);
        var reducer = new RegionReducer(mask, RegionStatistics.All);
        var frame = new float[source.FrameLength];
        var output = new double[mask.Count * RegionStatistics.All.Length];
        for (int t = 0; t < source.FrameCount; t++)
        {
            source.ReadFrame(t, frame);
            reducer.Reduce(frame, output);
            for (int r = 0; r < mask.Count; r++)
                for (int s = 0; s < RegionStatistics.All.Length; s++)
                {
                    string stat = RegionStatistics.All[s].Name();
                    double expected = reference.GetProperty(mask.Names[r]).GetProperty(stat)[t].GetDouble();
                    AssertRelative(expected, output[r * RegionStatistics.All.Length + s], 1e-9, $"{stat} of {mask.Names[r]} at {t}");
                }
        }
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void A_region_below_min_valid_gives_NaN_and_is_counted()
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc");
        ExternalTools.RunPython("make_stats_fixture.py", input, "NETCDF3_64BIT_OFFSET");
        string output = dir.File("series.nc");
        // frame 3 has everything north of 60°N missing: the band 60–90°N has no data there, and 30–60°N stays above one half.
        var summary = StatsStep.Run(new StatsOptions([input], "tcwv", ["bands:30"], [RegionStatistic.Mean], output, MinValid: 0.5));
        using var series = DatasetFiles.Open(output);
        var mean = series.ReadAllDoubles(series.RequireVariable("mean"));
        int north = Array.IndexOf(series.ReadText(series.RequireVariable("region_name")), "band_n60_n90");
        Assert.True(double.IsNaN(mean[3 * 6 + north]));
        Assert.False(double.IsNaN(mean[2 * 6 + north]));
        Assert.Equal(1, summary.NoData + summary.BelowMinValid);
    }

    static void AssertRelative(double expected, double actual, double tolerance, string what) =>
        Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Max(1e-300, Math.Abs(expected)),
            $"{what}: expected {expected:R}, got {actual:R} (relative {Math.Abs(actual - expected) / Math.Abs(expected):E2})");

    static class Summary
    {
        public static readonly string Radius = GridDrift.Grids.Sphere.MeanEarthRadius.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
    }
}
