using GridDrift.Tests.Support;

namespace GridDrift.Tests.Outputs;

/// <summary>
/// A product never takes a variable name that netCDF-C refuses (names beginning with '.', or
/// holding '/' or control characters): the fields of a climatology and of anomalies of an input
/// variable named "..tcwv" get a safe name, and netCDF-C's ncdump reads the products.
/// </summary>
public class ProductNameTests
{
    [InteropFact(Needs.Ncdump)]
    public void Products_of_an_oddly_named_variable_are_readable_by_netCDF_C()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 40, stepHours: 24, variable: "..tcwv");
        Assert.Equal(0, CliRun.Run("climatology", input, "--var", "..tcwv", "--out", dir.File("c.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("anomalies", input, "--var", "..tcwv", "--climatology", dir.File("c.nc"), "--out", dir.File("a.nc"), "--quiet").ExitCode);
        foreach (var product in new[] { "c.nc", "a.nc" })
        {
            var dump = ExternalTools.Run("ncdump", $"-h {dir.File(product)}");
            Assert.True(dump.ExitCode == 0, dump.Stderr);
            Assert.Contains("v_..tcwv", dump.Stdout);
        }
    }
}
