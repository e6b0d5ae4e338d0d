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
}
