using GridDrift.Tests.Support;

namespace GridDrift.Tests.Regions;

/// <summary>
/// Region specifications that could never finish or never make sense are usage errors found while
/// parsing (exit 1, one line, within the test's time limit); a region file whose content is not a
/// set of polygons on the sphere (RFC 7946: positions are longitude, latitude in degrees) is bad
/// input (exit 2, one line).
/// </summary>
public class HostileRegionTests
{
    static CliRun.Outcome Stats(TempFolder dir, params string[] regions) =>
        CliRun.Run(["stats", SampleFiles.Record(dir.File("in.nc")), "--var", "tcwv", "--out", dir.File("s.nc"), "--regions", .. regions]);

    [Theory]
    [InlineData("box:x=-10,10,1e17,0")]
    [InlineData("box:x=-10,10,-1e20,1e20")]
    [InlineData("bands:1e-9")]
    [InlineData("tiles:0.01x0.01")]
    [InlineData("tiles:1x1e-300")]
    [InlineData("box:x=10,-10,0,30")]
    public void Specifications_out_of_range_are_usage_errors(string spec)
    {
        using var dir = new TempFolder();
        var outcome = Stats(dir, spec);
        Assert.Equal(1, outcome.ExitCode);
        Assert.StartsWith("griddrift stats: --regions", Assert.Single(outcome.StderrLines));
    }

    [Theory]
    [InlineData("{\"type\":\"FeatureCollection\",\"features\":{}}")]
    [InlineData("{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":null}")]
    [InlineData("{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":{\"type\":\"Polygon\"}}")]
    [InlineData("{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[0,0],[10,200],[20,0],[0,0]]]}}")]
    [InlineData("{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[0,0],[10,0],[20,0],[0,0]]]}}")]
    [InlineData("{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[0,0],[\"x\",0],[20,5],[0,0]]]}}")]
    public void A_region_file_that_is_not_polygons_on_the_sphere_is_bad_input(string json)
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("r.geojson"), json);
        var outcome = Stats(dir, "file:" + dir.File("r.geojson"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("r.geojson", Assert.Single(outcome.StderrLines));
    }

    static string Feature(string coordinates) =>
        "{\"type\":\"Feature\",\"properties\":{\"name\":\"a\"},\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[" + coordinates + "]}}";

    /// <summary>
    /// Rings that are not simple (OGC Simple Features; common practice in GIS validity checks): a
    /// bow-tie whose edges cross, a figure eight that touches itself at one vertex, a spike that
    /// folds back along an edge. Each is refused naming the region and the crossing.
    /// </summary>
    [Theory]
    [InlineData("[[0,0],[10,10],[10,0],[0,10],[0,0]]")]
    [InlineData("[[0,0],[5,5],[10,0],[10,10],[5,5],[0,10],[0,0]]")]
    [InlineData("[[0,0],[10,0],[10,10],[10,5],[10,12],[0,10],[0,0]]")]
    public void A_ring_that_crosses_itself_is_bad_input(string ring)
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("r.geojson"), Feature(ring));
        var outcome = Stats(dir, "file:" + dir.File("r.geojson"));
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains("region 'a': a ring crosses itself", line);
    }

    /// <summary>
    /// Simple rings are kept: a concave U, a square with a repeated vertex, and a circle of 150,000
    /// positions (within the position limit), checked in well under the time a mask takes.
    /// </summary>
    [Fact]
    public void Simple_rings_concave_or_long_are_accepted()
    {
        var circle = string.Join(",", Enumerable.Range(0, 150_000).Select(i => (2 * Math.PI * i / 150_000))
            .Select(t => FormattableString.Invariant($"[{20 * Math.Cos(t):R},{20 * Math.Sin(t):R}]"))) + ",[20,0]";
        foreach (var ring in new[] { "[0,0],[30,0],[30,30],[20,30],[20,10],[10,10],[10,30],[0,30],[0,0]", "[0,0],[10,0],[10,0],[10,10],[0,10],[0,0]", circle })
        {
            using var dir = new TempFolder();
            File.WriteAllText(dir.File("r.geojson"), Feature("[" + ring + "]"));
            var watch = System.Diagnostics.Stopwatch.StartNew();
            var shapes = GridDrift.Regions.GeoJsonRegions.Read(dir.File("r.geojson"));
            Assert.True(watch.Elapsed < TimeSpan.FromSeconds(5), $"{watch.Elapsed} to read {ring.Length} characters");
            Assert.Single(shapes);
        }
    }
}
