using System.Text.Json;
using GridDrift.Operators.Climatology;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Climatology;

/// <summary>
/// The CF Conventions §7.4 structure (CF-1.12, "Climatological statistics"), attribute by
/// attribute, as python netCDF4 and cftime read it: the time coordinate names its bounds with
/// `climatology` and has no `bounds`; the bounds variable is (time, nv); cell_methods use the
/// within/over forms of §7.4 (the diurnal kind its three-part form, as in the section's
/// example of a diurnal cycle over several years); the data variable keeps the input's name
/// and (time, lat, lon) order with descending latitudes untouched. The expected dates follow
/// from the invented record (daily 2030-01-01 … 2033-12-31): month slot January runs from
/// 2030-01-01 to 2033-02-01.
/// </summary>
public class ClimatologyStructureTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Month_climatology_follows_section_7_4()
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc"), output = dir.File("clim.nc");
        ExternalTools.RunPython("make_climatology_fixture.py", input, "standard", "NETCDF3_64BIT_OFFSET", "24", "4");
        ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.Month, output));
        var f = JsonDocument.Parse(ExternalTools.RunPython("climatology_attributes.py", output, "tcwv")).RootElement;
        var vars = f.GetProperty("variables");
        var time = vars.GetProperty("time").GetProperty("attributes");
        Assert.Equal("climatology_bounds", time.GetProperty("climatology").GetString());
        Assert.False(time.TryGetProperty("bounds", out _), "a climatological time axis has climatology, not bounds (CF §7.4)");
        Assert.Equal(["time", "nv"], vars.GetProperty("climatology_bounds").GetProperty("dimensions").EnumerateArray().Select(e => e.GetString()));
        Assert.Equal(["time", "lat", "lon"], vars.GetProperty("tcwv").GetProperty("dimensions").EnumerateArray().Select(e => e.GetString()));
        Assert.Equal("time: mean within years time: mean over years", Attr(vars, "tcwv", "cell_methods"));
        Assert.StartsWith("time: standard_deviation within years time: standard_deviation over years", Attr(vars, "tcwv_std", "cell_methods"));
        Assert.Equal("time: sum within years time: sum over years", Attr(vars, "tcwv_count", "cell_methods"));
        Assert.Equal("atmosphere_mass_content_of_water_vapor number_of_observations", Attr(vars, "tcwv_count", "standard_name"));
        Assert.Equal("kg m-2", Attr(vars, "tcwv", "units"));
        Assert.Equal([40.0, 20.0, 0.0, -20.0, -40.0], f.GetProperty("lat").EnumerateArray().Select(e => e.GetDouble()));
        var bounds = f.GetProperty("bounds").EnumerateArray().Select(r => r.EnumerateArray().Select(e => e.GetString()!).ToArray()).ToArray();
        Assert.Equal(12, bounds.Length);
        Assert.Equal(["2030-01-01T00:00:00", "2033-02-01T00:00:00"], bounds[0]);
        Assert.Equal(["2030-12-01T00:00:00", "2034-01-01T00:00:00"], bounds[11]);
        Assert.Equal("2030-01-16T12:00:00", f.GetProperty("times")[0].GetString()); // middle of January's first period
        var globals = f.GetProperty("globals");
        Assert.Equal("month", globals.GetProperty("climatology_kind").GetString());
        Assert.Equal("2030-01-01T00:00:00/2034-01-01T00:00:00", globals.GetProperty("climatology_base_period").GetString());
        Assert.Equal("CF-1.12", globals.GetProperty("Conventions").GetString());
        Assert.Contains("not a warning or forecasting service", globals.GetProperty("caution").GetString());
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Diurnal_climatology_uses_the_three_part_cell_methods()
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc"), output = dir.File("clim.nc");
        ExternalTools.RunPython("make_climatology_fixture.py", input, "standard", "NETCDF4", "6", "2");
        ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.HourByMonth, output));
        var f = JsonDocument.Parse(ExternalTools.RunPython("climatology_attributes.py", output, "tcwv")).RootElement;
        var vars = f.GetProperty("variables");
        Assert.Equal("time: mean within days time: mean over days time: mean over years", Attr(vars, "tcwv", "cell_methods"));
        var bounds = f.GetProperty("bounds").EnumerateArray().Select(r => r.EnumerateArray().Select(e => e.GetString()!).ToArray()).ToArray();
        Assert.Equal(48, bounds.Length); // 12 months x 4 times of day of six-hourly data
        // slot (January, 06:00): from its first sample to its last sample plus the six-hour step
        Assert.Equal(["2030-01-01T06:00:00", "2031-01-31T12:00:00"], bounds[1]);
        Assert.Equal("00:00:00 06:00:00 12:00:00 18:00:00", f.GetProperty("globals").GetProperty("climatology_times_of_day").GetString());
    }

    static string? Attr(JsonElement vars, string variable, string name) =>
        vars.GetProperty(variable).GetProperty("attributes").GetProperty(name).GetString();
}
