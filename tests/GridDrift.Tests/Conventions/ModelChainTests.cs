using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Conventions;

/// <summary>
/// Issue 8's chain in two commands: a noleap model field of specific humidity on pressure levels
/// (python netCDF4) becomes a standard-calendar daily column water vapour on an observation grid:
/// `derive column-water-vapour`, then `regrid --to OBS --calendar standard --resample daily`.
/// Checked with python netCDF4/cftime and numpy (Interop/scripts/model_chain_reference.py): CF
/// metadata, daily bounds, the dates (no 29 February: the noleap record has none), and the values.
/// </summary>
public class ModelChainTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void A_noleap_humidity_record_becomes_standard_calendar_daily_column_water_on_the_observation_grid()
    {
        using var dir = new TempFolder();
        string model = dir.File("model.nc"), obs = dir.File("obs.nc"), column = dir.File("tcwv_model.nc"), daily = dir.File("tcwv_daily.nc");
        ExternalTools.RunPython("model_chain_reference.py", "make", model, obs);
        var first = CliRun.Run("derive", "column-water-vapour", model, "--out", column, "--quiet");
        Assert.True(first.ExitCode == 0, first.Stderr);
        var second = CliRun.Run("regrid", column, "--var", "tcwv", "--to", obs, "--calendar", "standard", "--resample", "daily", "--out", daily, "--quiet");
        Assert.True(second.ExitCode == 0, second.Stderr);
        var r = JsonDocument.Parse(ExternalTools.RunPython("model_chain_reference.py", "check", model, daily)).RootElement;
        Assert.Equal("standard", r.GetProperty("calendar").GetString());
        Assert.Equal(["2032-02-26", "2032-02-27", "2032-02-28", "2032-03-01", "2032-03-02", "2032-03-03"], r.GetProperty("dates").EnumerateArray().Select(e => e.GetString()!));
        Assert.Equal(["2032-02-28T00:00:00", "2032-02-29T00:00:00"], r.GetProperty("bounds")[2].EnumerateArray().Select(e => e.GetString()!));
        Assert.Equal("area: mean time: mean", r.GetProperty("cell_methods").GetString());
        Assert.Equal("atmosphere_mass_content_of_water_vapor", r.GetProperty("standard_name").GetString());
        Assert.Equal("kg m-2", r.GetProperty("units").GetString());
        Assert.Equal([6, 3, 6], r.GetProperty("shape").EnumerateArray().Select(e => e.GetInt32()));
        Assert.True(r.GetProperty("max_rel").GetDouble() < 1e-6, $"largest relative difference from numpy {r.GetProperty("max_rel").GetDouble():E2}");
    }

    [Fact]
    public void A_360_day_record_is_not_shifted_onto_the_standard_calendar()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("m.nc"), frames: 10, stepHours: 24, calendar: "360_day", nlat: 3, nlon: 4);
        var outcome = CliRun.Run("regrid", input, "--var", "tcwv", "--to", "regular:30", "--calendar", "standard", "--out", dir.File("r.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("360_day", Assert.Single(outcome.StderrLines));
    }
}
