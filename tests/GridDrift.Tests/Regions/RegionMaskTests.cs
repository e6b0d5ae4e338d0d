using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Regions;

/// <summary>Region areas against the zone formula 2πR²(sin φ₂ − sin φ₁) × (Δλ / 360°), and region naming.</summary>
public class RegionMaskTests
{
    const double R = Sphere.MeanEarthRadius;
    static double Zone(double south, double north, double degrees = 360) =>
        2 * Math.PI * R * R * (Math.Sin(north * Math.PI / 180) - Math.Sin(south * Math.PI / 180)) * degrees / 360;

    static double[] Range(double start, double step, int n) => Enumerable.Range(0, n).Select(i => start + step * i).ToArray();

    // 0.75° grid with cells centred on the poles and on ±30°: a band edge at 30° cuts those cells in half.
    static readonly Grid Era = RectilinearGrid.Build(Range(90, -0.75, 241), Range(-180, 0.75, 480));

    static RegionMask Mask(Grid grid, params string[] specs) => RegionMaskBuilder.Build(grid, RegionSpecs.Parse(specs));

    [Fact]
    public void Bands_have_the_zone_area_even_where_their_edges_cut_cells()
    {
        var mask = Mask(Era, "bands:30");
        Assert.Equal(["band_s90_s60", "band_s60_s30", "band_s30_n00", "band_n00_n30", "band_n30_n60", "band_n60_n90"], mask.Names);
        for (int b = 0; b < 6; b++)
            Assert.Equal(1, mask.RegionArea[b] / Zone(-90 + 30 * b, -60 + 30 * b), 12);
        // the row centred on 30°N is split half and half between two bands
        int row = Array.IndexOf(Range(90, -0.75, 241), 30.0);
        int cell = Era.FrameIndex(row, 0);
        var inside = Enumerable.Range(0, mask.Count).Select(r => AreaInside(mask, r, cell)).Where(a => a > 0).ToArray();
        Assert.Equal(2, inside.Length);
        Assert.Equal(0.5, inside[0] / Era.CellArea[cell], 2); // not exactly ½: the cell's two halves differ in area on the sphere
        Assert.Equal(1, inside.Sum() / Era.CellArea[cell], 12);
    }

    static double AreaInside(RegionMask mask, int region, int cell)
    {
        var cells = mask.CellsOf(region).ToArray();
        int k = Array.IndexOf(cells, cell);
        return k < 0 ? 0 : mask.AreasOf(region)[k];
    }

    [Fact]
    public void A_box_across_the_date_line_is_the_same_on_0_360_and_minus180_180_grids()
    {
        var east = RectilinearGrid.Build(Range(-89.5, 1, 180), Range(0.5, 1, 360));
        var west = RectilinearGrid.Build(Range(-89.5, 1, 180), Range(-179.5, 1, 360));
        foreach (var grid in new[] { east, west })
        {
            var mask = Mask(grid, "box:pacific=-10.5,20.25,170.25,-160.5");
            Assert.Equal(1, mask.RegionArea[0] / Zone(-10.5, 20.25, 29.25), 12);
        }
    }

    [Fact]
    public void Tiles_partition_the_sphere_and_are_named_by_their_edges()
    {
        var mask = Mask(Era, "tiles:20x30");
        Assert.Equal(9 * 12, mask.Count);
        Assert.Contains("tile_n10_n30_e000_e030", mask.Names); // from −90° in 20° steps: …, −10, 10, 30, …
        Assert.Contains("tile_s90_s70_e330_e360", mask.Names);
        Assert.Equal(1, mask.RegionArea.Sum() / (4 * Math.PI * R * R), 12);
        Assert.Equal(1, mask.RegionArea[Array.IndexOf(mask.Names, "tile_n10_n30_e000_e030")] / Zone(10, 30, 30), 12);
    }

    [Fact]
    public void Global_is_the_whole_domain_of_a_limited_area_grid()
    {
        var limited = RectilinearGrid.Build(Range(-9.5, 1, 20), Range(100.5, 1, 40));
        var mask = Mask(limited, "global");
        Assert.Equal(["global"], mask.Names);
        Assert.Equal(1, mask.RegionArea[0] / Zone(-10, 10, 40), 12);
    }

    static string GeoJson(TempFolder dir, string body)
    {
        string path = dir.File("regions.geojson");
        File.WriteAllText(path, "{\"type\":\"FeatureCollection\",\"features\":[" + body + "]}");
        return path;
    }

    [Fact]
    public void Polygons_with_holes_and_across_the_antimeridian_cover_their_area_within_the_stated_accuracy()
    {
        // Polygon edges along parallels and meridians bound lat-lon rectangles, whose areas are known exactly.
        using var dir = new TempFolder();
        string path = GeoJson(dir, """
            {"type":"Feature","properties":{"name":"frame"},"geometry":{"type":"Polygon","coordinates":[
              [[10.3,10.2],[50.1,10.2],[50.1,40.7],[10.3,40.7],[10.3,10.2]],
              [[20.6,20.4],[30.2,20.4],[30.2,30.9],[20.6,30.9],[20.6,20.4]]]}},
            {"type":"Feature","properties":{"name":"dateline"},"geometry":{"type":"Polygon","coordinates":[
              [[170.2,-5.3],[-170.4,-5.3],[-170.4,5.6],[170.2,5.6],[170.2,-5.3]]]}}
            """);
        var grid = RectilinearGrid.Build(Range(-89.5, 1, 180), Range(0.5, 1, 360));
        var mask = RegionMaskBuilder.Build(grid, GeoJsonRegions.Read(path));
        double frame = Zone(10.2, 40.7, 39.8) - Zone(20.4, 30.9, 9.6);
        double dateline = Zone(-5.3, 5.6, 19.4);
        // Each cut cell is sampled 8 × 8: its fraction is off by at most 1/8 along a cut, about 1/16 on average,
        // and errors along an edge largely cancel; a 1 % bound on these regions is generous.
        Assert.Equal(1, mask.RegionArea[0] / frame, 2);
        Assert.Equal(1, mask.RegionArea[1] / dateline, 2);
    }

    [Theory]
    [InlineData("bands:0")]
    [InlineData("tiles:20")]
    [InlineData("box:x=10,5,0,10")]
    [InlineData("box:=0,1,0,1")]
    [InlineData("circle:3")]
    public void Malformed_region_specifications_are_refused(string spec) =>
        Assert.Throws<FormatException>(() => RegionSpecs.Parse([spec]));
}
