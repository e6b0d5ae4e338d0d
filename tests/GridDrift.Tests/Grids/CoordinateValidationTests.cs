using GridDrift.Tests.Support;

namespace GridDrift.Tests.Grids;

/// <summary>
/// Coordinates that cannot describe a grid on the sphere are refused before any area is computed
/// (CF §4.1: latitude in degrees north, so within ±90; a coordinate variable is strictly
/// monotonic, NetCDF User Guide and CF §1.3): exit 2 with one line naming the file and the variable.
/// </summary>
public class CoordinateValidationTests
{
    [Theory]
    [InlineData(new float[] { -62, -99, -128, 0 }, new float[] { 0, 90, 180, 270 }, "lat")]
    [InlineData(new float[] { -60, -20, 20, 60 }, new float[] { 0, 90, 1.2e12f, 270 }, "lon")]
    [InlineData(new float[] { -60, 20, -20, 60 }, new float[] { 0, 90, 180, 270 }, "lat")]
    [InlineData(new float[] { -60, -20, 20, 60 }, new float[] { 0, 90, 90, 270 }, "lon")]
    [InlineData(new float[] { -60, float.NaN, 20, 60 }, new float[] { 0, 90, 180, 270 }, "lat")]
    public void Broken_coordinates_are_refused_naming_the_variable(float[] latitudes, float[] longitudes, string variable)
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("in.nc"), nlat: 4, nlon: 4, latitudes: latitudes, longitudes: longitudes);
        var outcome = CliRun.Run("stats", path, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains($"variable '{variable}'", line);
        Assert.False(File.Exists(dir.File("s.nc")));
    }

    [Fact]
    public void A_descending_latitude_axis_is_a_grid()
    {
        using var dir = new TempFolder();
        string path = SampleFiles.Record(dir.File("in.nc"), nlat: 4, nlon: 4, latitudes: [60, 20, -20, -60]);
        Assert.Equal(0, CliRun.Run("stats", path, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"), "--quiet").ExitCode);
    }
}
