using GridDrift.Grids;

namespace GridDrift.Tests.Grids;

/// <summary>
/// Pixel to latitude/longitude of the CF geostationary mapping against the CGMS LRIT/HRIT Global
/// Specification (CGMS/DOC/12/0017, §4.4.3.2) worked by hand: its constants for the nominal
/// geostationary orbit are h = 42164 km from the Earth's centre, r_eq = 6378.1370 km,
/// r_pol = 6356.7523 km (WGS 84).
/// </summary>
public class GeostationaryTests
{
    const double Req = 6378137.0, Rpol = 6356752.3, H = 42164000.0;
    static readonly GeostationaryProjection Msg = new(H - Req, Req, Rpol, 9.5, "y");

    /// <summary>The CGMS inverse navigation, written out as the specification gives it (y counted positive northward, as CF does).</summary>
    static (double Lat, double Lon)? Cgms(double x, double y, double subLon)
    {
        double k = Req * Req / (Rpol * Rpol);
        double root = Math.Pow(H * Math.Cos(x) * Math.Cos(y), 2) - (Math.Cos(y) * Math.Cos(y) + k * Math.Sin(y) * Math.Sin(y)) * (H * H - Req * Req);
        if (root < 0) return null;
        double sd = Math.Sqrt(root);
        double sn = (H * Math.Cos(x) * Math.Cos(y) - sd) / (Math.Cos(y) * Math.Cos(y) + k * Math.Sin(y) * Math.Sin(y));
        double s1 = H - sn * Math.Cos(x) * Math.Cos(y);
        double s2 = sn * Math.Sin(x) * Math.Cos(y);
        double s3 = sn * Math.Sin(y);
        double sxy = Math.Sqrt(s1 * s1 + s2 * s2);
        return (Math.Atan(k * s3 / sxy) * 180 / Math.PI, Math.Atan(s2 / s1) * 180 / Math.PI + subLon);
    }

    [Fact]
    public void The_sub_satellite_pixel_is_at_the_equator_below_the_satellite()
    {
        var p = Msg.ToLatLon(0, 0)!.Value;
        Assert.Equal(0, p.Lat, 12);
        Assert.Equal(9.5, p.Lon, 12);
    }

    [Theory]
    [InlineData(0.0, 0.1)]
    [InlineData(0.1, -0.05)]
    [InlineData(-0.08, 0.08)]
    public void Pixels_on_the_disk_match_the_CGMS_formulas(double x, double y)
    {
        var ours = Msg.ToLatLon(x, y)!.Value;
        var cgms = Cgms(x, y, 9.5)!.Value;
        Assert.Equal(cgms.Lat, ours.Lat, 9);
        Assert.Equal(cgms.Lon, ours.Lon, 9);
    }

    [Fact]
    public void A_pixel_at_the_disk_edge_is_on_the_disk_and_one_just_beyond_is_not()
    {
        // On the equator the disk's edge is at the scan angle asin(r_eq / h) (the line of sight grazes the sphere).
        double edge = Math.Asin(Req / H);
        var inside = Msg.ToLatLon(edge * 0.9999, 0)!.Value;
        var cgms = Cgms(edge * 0.9999, 0, 9.5)!.Value;
        Assert.Equal(cgms.Lon, inside.Lon, 6);
        Assert.True(inside.Lon - 9.5 > 80, $"a limb pixel lies more than 80° from the sub-satellite longitude (got {inside.Lon - 9.5})");
        Assert.Null(Msg.ToLatLon(edge * 1.0001, 0));
        Assert.Null(Cgms(edge * 1.0001, 0, 9.5));
    }

    [Fact]
    public void Off_disk_pixels_are_invalid_cells()
    {
        double[] scan = Enumerable.Range(0, 21).Select(i => -0.16 + 0.016 * i).ToArray(); // ±0.16 rad spans beyond the disk (±0.151)
        var grid = Msg.BuildGrid(scan, scan);
        Assert.Equal(0, grid.CellArea[0]);                    // a corner of the scan: space
        Assert.True(grid.CellArea[10 * 21 + 10] > 0);         // the centre: Earth
        Assert.Equal(GridKind.Geostationary, grid.Kind);
    }

    [Fact]
    public void The_cells_on_the_disk_approach_the_visible_cap_as_pixels_shrink()
    {
        // A sphere seen from distance H from its centre shows a cap of area 2πR²(1 − R/H). Cells
        // wholly on the disk cover less, the loss a ring of ever thinner limb pixels.
        var sphere = new GeostationaryProjection(H - Req, Req, Req, 0, "y");
        double cap = 2 * Math.PI * Req * Req * (1 - Req / H);
        double Covered(int n)
        {
            var scan = Enumerable.Range(0, n).Select(i => (i - (n - 1) / 2.0) * (2 * 0.1535 / n)).ToArray();
            return sphere.BuildGrid(scan, scan, Req).TotalArea / cap;
        }
        double coarse = Covered(128), fine = Covered(1024);
        Assert.True(coarse < fine && fine < 1, $"coverage {coarse} then {fine}");
        Assert.InRange(fine, 0.93, 1.0);
    }
}
