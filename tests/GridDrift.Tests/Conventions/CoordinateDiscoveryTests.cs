using GridDrift.Conventions.Coordinates;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Grids;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Conventions;

/// <summary>Coordinate discovery by the rules of CF Conventions 1.12, chapters 4 and 5.</summary>
public class CoordinateDiscoveryTests
{
    static NcVariable Coordinate(string name, params NcAttribute[] attributes) =>
        new(name, NcType.Float, [new NcDimension(name, 3, false)], attributes);

    [Theory]
    // CF §4.1: "The recommended unit of latitude is degrees_north. Also acceptable are degree_north, degree_N, degrees_N, degreeN, and degreesN."
    [InlineData("degrees_north")]
    [InlineData("degree_north")]
    [InlineData("degree_N")]
    [InlineData("degrees_N")]
    [InlineData("degreeN")]
    [InlineData("degreesN")]
    public void Latitude_is_recognised_by_every_CF_spelling_of_its_units(string units) =>
        Assert.Equal(AxisRole.Latitude, AxisClassifier.Classify(Coordinate("y", NcAttribute.Text("units", units))));

    [Theory]
    // CF §4.2: degrees_east, degree_east, degree_E, degrees_E, degreeE, degreesE.
    [InlineData("degrees_east")]
    [InlineData("degree_east")]
    [InlineData("degree_E")]
    [InlineData("degrees_E")]
    [InlineData("degreeE")]
    [InlineData("degreesE")]
    public void Longitude_is_recognised_by_every_CF_spelling_of_its_units(string units) =>
        Assert.Equal(AxisRole.Longitude, AxisClassifier.Classify(Coordinate("x", NcAttribute.Text("units", units))));

    [Fact]
    public void Standard_name_axis_positive_and_pressure_units_identify_the_other_axes()
    {
        Assert.Equal(AxisRole.Latitude, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("standard_name", "latitude"))));
        Assert.Equal(AxisRole.Time, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("units", "days since 1979-01-01")))); // CF §4.4
        Assert.Equal(AxisRole.Time, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("axis", "T"))));
        Assert.Equal(AxisRole.Vertical, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("units", "millibars")))); // CF §4.3: pressure units
        Assert.Equal(AxisRole.Vertical, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("positive", "up"))));
        Assert.Equal(AxisRole.Vertical, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("axis", "Z"))));
        Assert.Equal(AxisRole.ProjectionX, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("standard_name", "projection_x_angular_coordinate"))));
        Assert.Equal(AxisRole.None, AxisClassifier.Classify(Coordinate("a", NcAttribute.Text("units", "K"))));
    }

    static string CurvilinearFile(TempFolder dir)
    {
        // CF §5.2: 2-D latitude/longitude named by the data variable's coordinates attribute; §5.6 grid_mapping.
        string path = dir.File("curvilinear.nc");
        using var w = ClassicWriter.Create(path);
        var t = w.AddDimension("time", 0, unlimited: true);
        var y = w.AddDimension("y", 2);
        var x = w.AddDimension("x", 3);
        var vt = w.AddVariable("time", NcType.Double, [t], [NcAttribute.Text("units", "hours since 2031-01-01")]);
        var lat = w.AddVariable("nav_lat", NcType.Float, [y, x], [NcAttribute.Text("units", "degrees_north"), NcAttribute.Text("bounds", "lat_vertices")]);
        var lon = w.AddVariable("nav_lon", NcType.Float, [y, x], [NcAttribute.Text("units", "degrees_east")]);
        w.AddVariable("lat_vertices", NcType.Float, [y, x]);
        w.AddVariable("crs", NcType.Int, [], [NcAttribute.Text("grid_mapping_name", "rotated_latitude_longitude")]);
        var q = w.AddVariable("q", NcType.Float, [t, y, x], [NcAttribute.Text("coordinates", "nav_lat nav_lon"), NcAttribute.Text("grid_mapping", "crs")]);
        w.EndDefinitions();
        w.Write<float>(lat, [10, 10, 10, 20, 20, 20]);
        w.Write<float>(lon, [0, 5, 10, 1, 6, 11]);
        w.WriteRecord<double>(vt, 0, [0]);
        w.WriteRecord<float>(q, 0, [1, 2, 3, 4, 5, 6]);
        w.Commit();
        return path;
    }

    [Fact]
    public void Auxiliary_coordinates_bounds_and_grid_mapping_are_found_through_their_attributes()
    {
        using var dir = new TempFolder();
        using var reader = DatasetFiles.Open(CurvilinearFile(dir));
        var axes = VariableAxes.Discover(reader, reader.RequireVariable("q"));
        Assert.Equal("nav_lat", axes.Latitude!.Name);
        Assert.Equal("nav_lon", axes.Longitude!.Name);
        Assert.Equal("crs", axes.GridMapping!.Name);
        Assert.Equal("time", axes.Time!.Name);
        var roles = VariableRoles.Of(reader);
        Assert.Equal("bounds of nav_lat", roles["lat_vertices"]);
        Assert.Equal("grid mapping", roles["crs"]);
        Assert.Equal("auxiliary coordinate (latitude)", roles["nav_lat"]);
        Assert.Equal(GridKind.Curvilinear, DescribeStep.DescribeFile(reader.Path).Grid!.Kind);
    }

    [Fact]
    public void Longitude_conventions_and_latitude_order_are_reported_as_the_file_has_them()
    {
        var a = HorizontalGrid.FromAxes([90, 45, 0, -45, -90], Enumerable.Range(0, 8).Select(i => -180.0 + 45 * i).ToArray());
        Assert.True(a.LatitudeDescending);
        Assert.Equal("-180..180", a.LongitudeConvention);
        Assert.True(a.IsGlobalInLongitude);
        var b = HorizontalGrid.FromAxes([-60, 0, 60], [0, 90, 180, 270]);
        Assert.False(b.LatitudeDescending);
        Assert.Equal("0..360", b.LongitudeConvention);
        // Latitudes of a Gaussian grid are not evenly spaced (values here written from memory and rounded;
        // only the uneven spacing matters to this check).
        var g = HorizontalGrid.FromAxes([70.2, 52.0, 31.5, 10.5, -10.5, -31.5, -52.0, -70.2], [0, 90, 180, 270]);
        Assert.Equal(GridKind.IrregularLatLon, g.Kind);
    }
}
