using System.Text.Json;
using GridDrift.Tests.Interop;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// `griddrift describe --json` against the reference tools: dimensions, variables and formats as
/// python netCDF4 reports them, first/last times as cftime decodes them.
/// </summary>
public class DescribeCommandTests
{
    static JsonElement Json(CliRun.Outcome o)
    {
        Assert.True(o.ExitCode == 0, o.Stderr);
        return JsonDocument.Parse(o.Stdout).RootElement;
    }

    static string[] Cftime(string calendar, string units, params double[] values) =>
        ExternalTools.RunPythonWithInput("decode_times.py",
            $"{calendar}|{units}|{string.Join(",", values.Select(v => v.ToString(System.Globalization.CultureInfo.InvariantCulture)))}\n").Trim().Split(',');

    [InteropFact(Needs.Ncgen | Needs.PythonNetcdf)]
    public void Json_lists_format_dimensions_variables_and_time_as_the_reference_tools_do()
    {
        using var dir = new TempFolder();
        string path = ExternalTools.RunNcgen(Cdl.Common(cdf5Types: false, deflate: false), "nc6", dir.File("d.nc"));
        var json = Json(CliRun.Run("describe", path, "--json"));
        var reference = ReferenceDump.Of(path);

        Assert.Equal("64-bit offset", json.GetProperty("format").GetString());
        foreach (var (name, size, _) in reference.Dimensions)
            Assert.Equal(size, json.GetProperty("dimensions").GetProperty(name).GetInt64());
        foreach (var (name, expected) in reference.Variables.Select(p => (p.Name, p.Value)))
        {
            var v = json.GetProperty("variables").GetProperty(name);
            Assert.Equal(ReferenceDump.CdlKind(expected.GetProperty("kind").GetString()!), v.GetProperty("type").GetString());
            Assert.Equal(expected.GetProperty("dims").EnumerateArray().Select(e => e.GetString()), v.GetProperty("dims").EnumerateArray().Select(e => e.GetString()));
            Assert.Equal(expected.GetProperty("shape").EnumerateArray().Select(e => e.GetInt64()), v.GetProperty("shape").EnumerateArray().Select(e => e.GetInt64()));
            var units = expected.GetProperty("attributes").TryGetProperty("units", out var u) ? u.GetString() : null;
            Assert.Equal(units, v.GetProperty("units").GetString());
        }
        var time = json.GetProperty("time");
        var (first, last) = (Cftime("noleap", "hours since 2031-01-01 00:00:00", 0, 9)[0], Cftime("noleap", "hours since 2031-01-01 00:00:00", 0, 9)[1]);
        Assert.Equal(first, time.GetProperty("first").GetString());
        Assert.Equal(last, time.GetProperty("last").GetString());
        Assert.Equal("noleap", time.GetProperty("calendar").GetString());
        Assert.Equal(4, time.GetProperty("count").GetInt32());
        Assert.Equal("PT3H", time.GetProperty("step").GetString());
    }

    [InteropFact(Needs.PythonNetcdf | Needs.SharedData)]
    public void A_360_day_record_reports_its_dates_in_its_own_calendar()
    {
        var json = Json(CliRun.Run("describe", SharedData.Interop("ref_test_360_day_1900.nc"), "--json"));
        var expected = Cftime("360_day", "days since 1900-1-1", 0, 2299);
        Assert.Equal(expected[0], json.GetProperty("time").GetProperty("first").GetString());
        Assert.Equal(expected[1], json.GetProperty("time").GetProperty("last").GetString());
        Assert.Equal("P1D", json.GetProperty("time").GetProperty("step").GetString());
    }

    [InteropFact(Needs.SharedData)]
    public void The_reanalysis_sample_is_a_global_regular_grid_and_its_unusable_fill_is_reported()
    {
        // ../shared/data/reanalysis/README.md: 0.75° global grid, 480 × 241, latitudes 90 → -90.
        var json = Json(CliRun.Run("describe", SharedData.Reanalysis("eraint_uvz.nc"), "--json"));
        var grid = json.GetProperty("grid");
        Assert.Equal("RegularLatLon", grid.GetProperty("kind").GetString());
        Assert.Equal(0.75, grid.GetProperty("latitude_step").GetDouble(), 6);
        Assert.Equal(241, grid.GetProperty("rows").GetInt32());
        Assert.Equal(480, grid.GetProperty("columns").GetInt32());
        Assert.Contains("north to south", grid.GetProperty("description").GetString());
        Assert.Contains(json.GetProperty("warnings").EnumerateArray(), w => w.GetString()!.Contains("_FillValue NaN cannot be cast"));
    }

    [Fact]
    public void Several_files_are_described_with_the_record_they_form()
    {
        using var dir = new TempFolder();
        var b = SampleFiles.Record(dir.File("b.nc"), hours: [12, 15]);
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3]);
        var json = Json(CliRun.Run("describe", b, a, "--json"));
        Assert.Equal(2, json.GetProperty("files").GetArrayLength());
        var record = json.GetProperty("record");
        Assert.Equal([a, b], record.GetProperty("files").EnumerateArray().Select(e => e.GetString()));
        var gap = Assert.Single(record.GetProperty("time").GetProperty("gaps").EnumerateArray());
        Assert.Equal("2031-01-01T03:00:00", gap.GetProperty("after").GetString());
        Assert.Equal(2, gap.GetProperty("missing_steps").GetDouble(), 9); // 06:00 and 09:00 are absent
        var text = CliRun.Run("describe", b, a);
        Assert.Contains("gap between 2031-01-01T03:00:00 and 2031-01-01T12:00:00", text.Stdout);
    }
}
