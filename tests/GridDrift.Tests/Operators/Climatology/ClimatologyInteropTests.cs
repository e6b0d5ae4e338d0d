using System.Text.Json;
using GridDrift.Operators.Climatology;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Climatology;

/// <summary>
/// Climatologies of records written by python netCDF4 (four years of daily data in the
/// standard, noleap and 360_day calendars; two years of six-hourly data for the diurnal kind;
/// 3 % of cells missing) against numpy's nanmean / nanstd (ddof = 0) and valid counts per slot,
/// computed independently in Interop/scripts/climatology_reference.py, which also reads our
/// file back with python netCDF4. Means and standard deviations are stored in float32, so they
/// agree to float32 rounding (2e-6 relative, 1e-5 absolute); counts agree exactly, and so does
/// where values are missing.
/// </summary>
public class ClimatologyInteropTests
{
    public static TheoryData<string, string, string, double, int, string?> Cases() => new()
    {
        { "standard", "NETCDF3_64BIT_OFFSET", "month", 24, 4, null },
        { "standard", "NETCDF4", "day-of-year", 24, 4, null },
        { "noleap", "NETCDF3_CLASSIC", "day-of-year", 24, 4, null },
        { "360_day", "NETCDF4_CLASSIC", "day-of-year", 24, 4, null },
        { "360_day", "NETCDF3_64BIT_OFFSET", "month", 24, 4, "2031-01-01/2032-12-30" },
        { "standard", "NETCDF4", "hour-by-month", 6, 2, null },
        { "noleap", "NETCDF3_64BIT_OFFSET", "hour-by-month", 6, 2, "2030-03-01/2031-02-28" },
    };

    [InteropTheory(Needs.PythonNetcdf)]
    [MemberData(nameof(Cases))]
    public void Climatology_equals_numpy_group_statistics(string calendar, string format, string kind, double stepHours, int years, string? basePeriod)
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc"), output = dir.File("clim.nc");
        ExternalTools.RunPython("make_climatology_fixture.py", input, calendar, format, stepHours.ToString(System.Globalization.CultureInfo.InvariantCulture), years.ToString());
        var summary = ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKinds.Parse(kind)!.Value, output, Base: basePeriod, Workers: 2));
        var args = new List<string> { input, "tcwv", kind, output };
        if (basePeriod is not null)
        {
            // the reference takes a half-open [start, end): the day after the inclusive end
            var parts = basePeriod.Split('/');
            var end = GridDrift.Conventions.Time.TimePeriod.Parse(basePeriod, GridDrift.Conventions.Time.CfCalendars.Parse(calendar)!.Value).End;
            args.Add(parts[0]);
            args.Add($"{end.Year:0000}-{end.Month:00}-{end.Day:00}");
        }
        var json = JsonDocument.Parse(ExternalTools.RunPython("climatology_reference.py", [.. args])).RootElement;
        Assert.Equal(json.GetProperty("slots").GetInt32(), summary.Slots);
        foreach (var quantity in new[] { "mean", "std", "count" })
        {
            var expected = json.GetProperty("reference").GetProperty(quantity).EnumerateArray().ToArray();
            var ours = json.GetProperty("ours").GetProperty(quantity).EnumerateArray().ToArray();
            Assert.Equal(expected.Length, ours.Length);
            int compared = 0;
            for (int i = 0; i < expected.Length; i++)
            {
                bool missing = expected[i].ValueKind == JsonValueKind.Null;
                if (quantity == "count") missing = false;
                Assert.True(missing == (ours[i].ValueKind == JsonValueKind.Null), $"{quantity}[{i}] missing in one file only ({kind}, {calendar})");
                if (missing) continue;
                double e = expected[i].GetDouble(), o = ours[i].GetDouble();
                double tolerance = quantity == "count" ? 0 : 2e-6 * Math.Abs(e) + 1e-5;
                Assert.True(Math.Abs(o - e) <= tolerance, $"{quantity}[{i}] ({kind}, {calendar}): numpy {e:R}, ours {o:R}");
                compared++;
            }
            Assert.True(compared > expected.Length / 2, $"only {compared} of {expected.Length} {quantity} values had data");
        }
    }
}
