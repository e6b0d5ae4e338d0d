using System.Globalization;
using GridDrift.Conventions.Time;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// Time decoding in every CF calendar against cftime 1.6 (Debian python3-cftime, the calendar
/// library under python netCDF4): the same values and units must give the same dates.
/// </summary>
public class CalendarInteropTests
{
    static readonly (string Calendar, string Units, double[] Values)[] Cases =
    [
        ("standard", "days since 1500-01-01", [0, 1, 30000, 30303, 30304, 30305, 100000, -400.5]),
        ("gregorian", "hours since 1582-10-01 00:00:00", [0, 24 * 3, 24 * 4, 24 * 5, 100000.25]),
        ("proleptic_gregorian", "seconds since 1970-01-01T00:00:00Z", [0, 951782400, 4102444800, -2208988800, 1.5e9 + 0.75]),
        ("julian", "days since 1900-01-01", [0, 59, 60, 366, 40000]),
        ("noleap", "hours since 2031-1-1", [0, 1416, 1417, 8760, 87600 + 3]),
        ("365_day", "days since 0001-01-01", [0, 365 * 2000 + 58, 730000]),
        ("all_leap", "minutes since 2000-02-28 12:00", [0, 720, 1440 * 2, 1440 * 366 * 3]),
        ("366_day", "days since 1900-1-1", [2299, 0.25, 1e5]),
        ("360_day", "days since 1900-01-01 00:00:00", [0, 29, 30, 59, 359, 360, 2299, 12345.5]),
        ("360_day", "hours since 2001-02-30 06:00", [0, 18, 24 * 30]),
    ];

    [InteropFact(Needs.PythonNetcdf)]
    public void Decoded_dates_equal_cftime_in_every_calendar()
    {
        string input = string.Join("\n", Cases.Select(c => $"{c.Calendar}|{c.Units}|{string.Join(",", c.Values.Select(v => v.ToString("R", CultureInfo.InvariantCulture)))}"));
        var lines = ExternalTools.RunPythonWithInput("decode_times.py", input).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        for (int i = 0; i < Cases.Length; i++)
        {
            var (calendar, units, values) = Cases[i];
            var parsed = TimeUnits.Parse(units, CfCalendars.Parse(calendar)!.Value);
            var ours = values.Select(v => parsed.Decode(v).ToIsoString());
            Assert.Equal(lines[i].Split(','), ours);
        }
    }
}
