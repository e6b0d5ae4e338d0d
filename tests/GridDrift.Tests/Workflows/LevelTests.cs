using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Workflows;

/// <summary>
/// `--level VALUE[UNITS]` and `--at DIMENSION#INDEX` read a 2-D slice of data with levels: the
/// global mean of specific humidity at 500 hPa (asked for as 50000Pa, the file's levels being in
/// hPa) equals python netCDF4 + numpy with exact cell areas at that level
/// (Interop/scripts/level_means.py), and the product says so with a CF scalar coordinate (plev =
/// 500 hPa, standard_name air_pressure, named in the data variable's coordinates).
/// </summary>
public class LevelTests
{
    static string Sample => SharedData.Sample("q_levels_noleap_2031.nc");

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("--level", "50000Pa")]
    [InlineData("--level", "500")]
    [InlineData("--at", "plev#3")]
    [InlineData("--at", "plev=500")]
    public void A_level_is_read_as_numpy_reads_it_and_recorded_as_a_scalar_coordinate(string option, string value)
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("stats", Sample, "--var", "q", "--regions", "global", "bands:60", option, value, "--out", dir.File("s.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        var r = JsonDocument.Parse(ExternalTools.RunPython("level_means.py", Sample, "q", "500", dir.File("s.nc"))).RootElement;
        var expected = r.GetProperty("expected").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        var product = r.GetProperty("product").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        Assert.Equal(expected.Length, product.Length);
        for (int t = 0; t < expected.Length; t++) Assert.True(Math.Abs(expected[t] - product[t]) <= 1e-6 * Math.Abs(expected[t]), $"frame {t}: numpy {expected[t]}, GridDrift {product[t]}");
        Assert.Equal(500, r.GetProperty("plev").GetDouble());
        Assert.Equal("hPa", r.GetProperty("units").GetString());
        Assert.Equal("air_pressure", r.GetProperty("standard_name").GetString());
        Assert.Equal("region_name plev", r.GetProperty("coordinates").GetString());
    }

    [Fact]
    public void A_level_that_is_not_there_is_refused_listing_the_levels_and_levels_unchosen_are_named()
    {
        using var dir = new TempFolder();
        var missing = CliRun.Run("stats", Sample, "--var", "q", "--regions", "global", "--level", "300hPa", "--out", dir.File("s.nc"));
        Assert.Equal(2, missing.ExitCode);
        Assert.Contains("no such level; the levels are 1000, 850, 700, 500 hPa", Assert.Single(missing.StderrLines));
        var unchosen = CliRun.Run("stats", Sample, "--var", "q", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, unchosen.ExitCode);
        Assert.Contains("(plev = 4) with --level", Assert.Single(unchosen.StderrLines));
        var malformed = CliRun.Run("stats", Sample, "--var", "q", "--regions", "global", "--level", "high", "--out", dir.File("s.nc"));
        Assert.Equal(1, malformed.ExitCode);
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void A_recipe_level_applies_to_its_steps()
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("recipe.toml"), $"[input]\nfiles = [\"{Sample}\"]\nvariable = \"q\"\nout = \"products\"\nlevel = \"500hPa\"\n\n[stats]\n");
        var run = CliRun.Run("run", dir.File("recipe.toml"), "--quiet");
        Assert.True(run.ExitCode == 0, run.Stderr);
        var r = JsonDocument.Parse(ExternalTools.RunPython("level_means.py", Sample, "q", "500", dir.File("products/stats.nc"))).RootElement;
        Assert.Equal(500, r.GetProperty("plev").GetDouble());
        var expected = r.GetProperty("expected").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        var product = r.GetProperty("product").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int t = 0; t < expected.Length; t++) Assert.True(Math.Abs(expected[t] - product[t]) <= 1e-6 * Math.Abs(expected[t]));
    }

    /// <summary>Field products record the level too: a climatology at 500 hPa has the scalar plev, named in its fields' coordinates (ncdump's reading).</summary>
    [InteropFact(Needs.Ncdump)]
    public void A_climatology_at_a_level_carries_the_scalar_coordinate()
    {
        using var dir = new TempFolder();
        var outcome = CliRun.Run("climatology", Sample, "--var", "q", "--by", "month", "--level", "500hPa", "--out", dir.File("c.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        string dump = ExternalTools.Run("ncdump", $"-v plev \"{dir.File("c.nc")}\"").Stdout;
        Assert.Contains("\tdouble plev ;", dump);
        Assert.Contains("\t\tplev:standard_name = \"air_pressure\" ;", dump);
        Assert.Contains("\t\tq:coordinates = \"plev\" ;", dump);
        Assert.Contains(" plev = 500 ;", dump);
    }
}
