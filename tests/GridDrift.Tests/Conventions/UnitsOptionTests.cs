using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Conventions;

/// <summary>
/// `--units` on the commands that write a variable: values converted by the UDUNITS-2 definitions
/// (common practice: t[degC] = t[K] − 273.15; 1 kg m-2 = 1000 g m-2) and the units attribute
/// changed with them; a climatology in K still fits a record asked for in degC; units of another
/// dimension are refused with one line.
/// </summary>
public class UnitsOptionTests
{
    static string Kelvin(string path)
    {
        using var w = ClassicWriter.Create(path);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", 6);
        var lon = w.AddDimension("lon", 12);
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "days since 2031-01-01"), NcAttribute.Text("calendar", "noleap")]);
        var vlat = w.AddVariable("lat", NcType.Double, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Double, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var v = w.AddVariable("ta", NcType.Float, [time, lat, lon], [NcAttribute.Text("units", "K"), NcAttribute.Text("standard_name", "air_temperature")]);
        w.EndDefinitions();
        w.Write<double>(vlat, Enumerable.Range(0, 6).Select(j => -75.0 + 30 * j).ToArray());
        w.Write<double>(vlon, Enumerable.Range(0, 12).Select(i => 15.0 + 30 * i).ToArray());
        for (int t = 0; t < 40; t++)
        {
            w.WriteRecord<double>(vt, t, [t]);
            w.WriteRecord<float>(v, t, Enumerable.Range(0, 72).Select(c => (float)(280 + c % 5 + 0.1 * t)).ToArray());
        }
        w.Commit();
        return path;
    }

    [Fact]
    public void Regrid_in_degC_subtracts_273_15_and_says_so()
    {
        using var dir = new TempFolder();
        string input = Kelvin(dir.File("k.nc"));
        Assert.Equal(0, CliRun.Run("regrid", input, "--var", "ta", "--to", "regular:30", "--units", "degC", "--out", dir.File("c.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("regrid", input, "--var", "ta", "--to", "regular:30", "--out", dir.File("k30.nc"), "--quiet").ExitCode);
        using var c = DatasetFiles.Open(dir.File("c.nc"));
        using var k = DatasetFiles.Open(dir.File("k30.nc"));
        Assert.Equal("degC", c.RequireVariable("ta").Attributes.Text("units"));
        var celsius = c.ReadAllDoubles(c.RequireVariable("ta"));
        var kelvin = k.ReadAllDoubles(k.RequireVariable("ta"));
        for (int i = 0; i < celsius.Length; i++) Assert.True(Math.Abs(kelvin[i] - 273.15 - celsius[i]) < 1e-4, $"{kelvin[i]} K vs {celsius[i]} degC");
    }

    [Fact]
    public void Anomalies_in_degC_against_a_climatology_in_K_are_the_same_departures()
    {
        using var dir = new TempFolder();
        string input = Kelvin(dir.File("k.nc"));
        Assert.Equal(0, CliRun.Run("climatology", input, "--var", "ta", "--by", "month", "--out", dir.File("clim.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("anomalies", input, "--var", "ta", "--climatology", dir.File("clim.nc"), "--out", dir.File("a_k.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("anomalies", input, "--var", "ta", "--climatology", dir.File("clim.nc"), "--units", "degC", "--out", dir.File("a_c.nc"), "--quiet").ExitCode);
        using var ak = DatasetFiles.Open(dir.File("a_k.nc"));
        using var ac = DatasetFiles.Open(dir.File("a_c.nc"));
        var x = ak.ReadAllDoubles(ak.RequireVariable("ta"));
        var y = ac.ReadAllDoubles(ac.RequireVariable("ta"));
        for (int i = 0; i < x.Length; i++) Assert.True(Math.Abs(x[i] - y[i]) < 1e-3, $"{x[i]} vs {y[i]}");
        Assert.Equal("degC", ac.RequireVariable("ta").Attributes.Text("units"));
    }

    [Fact]
    public void A_comparison_converts_the_reference_to_the_candidates_units()
    {
        // the same temperatures in K (reference) and in degC (candidate): the bias is 0 once both are in degC
        using var dir = new TempFolder();
        string kelvin = Kelvin(dir.File("k.nc"));
        Assert.Equal(0, CliRun.Run("regrid", kelvin, "--var", "ta", "--to", kelvin, "--units", "degC", "--out", dir.File("c.nc"), "--quiet").ExitCode);
        var outcome = CliRun.Run("similarity", "--reference", kelvin, "--candidate", dir.File("c.nc"), "--var", "ta", "--regions", "global",
            "--metric", "bias,rmsd", "--range", "-100:100", "--out", dir.File("cmp.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        using var r = DatasetFiles.Open(dir.File("cmp.nc"));
        Assert.All(r.ReadAllDoubles(r.RequireVariable("bias")), b => Assert.True(Math.Abs(b) < 1e-3, $"bias {b}"));
        Assert.Equal("degC", r.RequireVariable("bias").Attributes.Text("units"));
    }

    [Fact]
    public void Derived_column_water_in_g_m2_is_a_thousand_times_the_kg_m2_value()
    {
        using var dir = new TempFolder();
        string sample = SharedData.Sample("q_levels_noleap_2031.nc");
        Assert.Equal(0, CliRun.Run("derive", "column-water-vapour", sample, "--out", dir.File("kg.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("derive", "column-water-vapour", sample, "--units", "g m-2", "--out", dir.File("g.nc"), "--quiet").ExitCode);
        using var kg = DatasetFiles.Open(dir.File("kg.nc"));
        using var g = DatasetFiles.Open(dir.File("g.nc"));
        var a = kg.ReadAllDoubles(kg.RequireVariable("tcwv"));
        var b = g.ReadAllDoubles(g.RequireVariable("tcwv"));
        for (int i = 0; i < a.Length; i++) Assert.True(Math.Abs(b[i] - 1000 * a[i]) <= 1e-6 * Math.Abs(b[i]) + 1e-6, $"{a[i]} kg m-2 vs {b[i]} g m-2");
        Assert.Equal("g m-2", g.RequireVariable("tcwv").Attributes.Text("units"));
    }

    [Fact]
    public void Units_of_another_dimension_are_refused_with_one_line()
    {
        using var dir = new TempFolder();
        string input = Kelvin(dir.File("k.nc"));
        var outcome = CliRun.Run("stats", input, "--var", "ta", "--regions", "global", "--units", "kg m-2", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        var line = Assert.Single(outcome.StderrLines);
        Assert.Contains("ta", line);
        Assert.Contains("kg m-2", line);
    }
}
