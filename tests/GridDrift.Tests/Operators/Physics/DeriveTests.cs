using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Physics;

/// <summary>
/// `griddrift derive column-water-vapour` on a python-netCDF4 fixture (q in g/kg on levels in hPa,
/// surface pressure in Pa above and below the deepest level) against numpy's trapz of the same
/// columns (Interop/scripts/column_water_reference.py); float32 output, so 1e-6 relative.
/// </summary>
public class DeriveTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Column_water_vapour_equals_numpy_with_units_converted_and_the_surface_bounding_the_column()
    {
        using var dir = new TempFolder();
        string input = dir.File("model.nc"), output = dir.File("tcwv.nc");
        ExternalTools.RunPython("column_water_reference.py", "make", input);
        var outcome = CliRun.Run("derive", "column-water-vapour", input, "--surface-pressure", "ps", "--out", output, "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var check = JsonDocument.Parse(ExternalTools.RunPython("column_water_reference.py", "check", input, output)).RootElement;
        Assert.Equal(60, check.GetProperty("n").GetInt32());
        Assert.True(check.GetProperty("max_rel").GetDouble() < 1e-6, $"largest relative difference from numpy {check.GetProperty("max_rel").GetDouble():E2}");
    }

    [Fact]
    public void An_unknown_quantity_is_refused_by_name()
    {
        var outcome = CliRun.Run("derive", "cloud-water", "x.nc", "--out", "y.nc");
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("cloud-water", Assert.Single(outcome.StderrLines));
    }

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("relative-humidity", "rh", "%", 4)]
    [InlineData("specific-humidity", "q", "kg kg-1", 3)]
    public void Humidity_conversions_equal_numpy_from_the_published_formulas(string quantity, string kind, string units, int rank)
    {
        // numpy evaluates Bolton (1980) eq. 10 and the definitions of e and q (Interop/scripts/humidity_reference.py)
        using var dir = new TempFolder();
        string input = dir.File("model.nc"), output = dir.File("out.nc");
        ExternalTools.RunPython("humidity_reference.py", "make", input);
        var args = quantity == "relative-humidity"
            ? new[] { "derive", quantity, input, "--out", output, "--quiet" }
            : new[] { "derive", quantity, input, "--pressure", "ps", "--out", output, "--quiet" };
        var outcome = CliRun.Run(args);
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var r = JsonDocument.Parse(ExternalTools.RunPython("humidity_reference.py", kind, input, output)).RootElement;
        Assert.Equal(units, r.GetProperty("units").GetString());
        Assert.Equal(rank, r.GetProperty("shape").GetArrayLength());
        Assert.True(r.GetProperty("max_rel").GetDouble() < 1e-6, $"{quantity}: largest relative difference from numpy {r.GetProperty("max_rel").GetDouble():E2}");
    }
}
