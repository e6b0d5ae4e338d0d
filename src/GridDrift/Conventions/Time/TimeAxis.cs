using GridDrift.Formats;

namespace GridDrift.Conventions.Time;

/// <summary>A decoded time coordinate: its units, calendar and instants, in file order.</summary>
internal sealed class TimeAxis
{
    public required string VariableName { get; init; }
    public required TimeUnits Units { get; init; }
    public required CfTime[] Times { get; init; }
    public required double[] RawValues { get; init; }
    public CfCalendar Calendar => Units.Calendar;
    /// <summary>The calendar attribute as the file spells it ("gregorian", "365_day" …), or "standard".</summary>
    public required string CalendarAttribute { get; init; }
    /// <summary>How the axis was read where that differs from the letter of CF (calendar months).</summary>
    public IReadOnlyList<string> Warnings { get; init; } = [];

    public static TimeAxis Read(IDatasetReader reader, NcVariable variable)
    {
        string? units = variable.Attributes.Text("units");
        if (units is null) throw new BadInputException(reader.Path, variable.Name, "time coordinate has no units attribute");
        string calendarText = variable.Attributes.Text("calendar") ?? "standard";
        var calendar = CfCalendars.Parse(calendarText)
            ?? throw new BadInputException(reader.Path, variable.Name, $"unknown calendar '{calendarText}' (CF §4.4.1 lists standard, proleptic_gregorian, julian, noleap, all_leap, 360_day)");
        TimeUnits parsed;
        try
        {
            parsed = TimeUnits.Parse(units, calendar);
        }
        catch (FormatException e)
        {
            throw new BadInputException(reader.Path, variable.Name, e.Message);
        }
        var raw = reader.ReadAllDoubles(variable);
        var codec = Values.ValueCodec.For(variable);
        var times = new CfTime[raw.Length];
        int monthsPerUnit = CalendarMonths(parsed);
        for (int i = 0; i < raw.Length; i++)
        {
            double value = raw[i] * codec.Scale + codec.Offset;
            if (!double.IsFinite(value) || Math.Abs(value * parsed.MicrosPerUnit) > 9e18)
                throw new BadInputException(reader.Path, variable.Name, $"time value at index {i} ({raw[i]}) is missing or out of range");
            if (monthsPerUnit > 0)
            {
                if (Math.Abs(value - Math.Round(value)) > 1e-9 * Math.Max(1, Math.Abs(value)))
                    throw new BadInputException(reader.Path, variable.Name,
                        $"time value {value} at index {i} is not a whole number of {parsed.UnitName}: '{units}' can only be read as calendar {parsed.UnitName} (UDUNITS' fixed-length month of 30.436875 days puts monthly data on the wrong days); give the time in days");
                times[i] = AddMonths(parsed.Reference, checked((long)Math.Round(value) * monthsPerUnit));
            }
            else times[i] = parsed.Decode(value);
        }
        return new TimeAxis
        {
            VariableName = variable.Name,
            Units = parsed,
            Times = times,
            RawValues = raw,
            CalendarAttribute = calendarText,
            Warnings = monthsPerUnit > 0 && raw.Length > 0
                ? [$"'{units}' is read as calendar {parsed.UnitName} from {parsed.Reference.ToIsoString()[..10]}, not as UDUNITS' fixed {(monthsPerUnit == 1 ? "30.436875-day months" : "365.242198781-day years")}"]
                : [],
        };
    }

    /// <summary>
    /// Months per unit when whole "months"/"years since" values are read as calendar months
    /// (common practice for monthly data; CF itself discourages these units), else 0. The
    /// 360_day calendar's months are 30 days already, so its fixed lengths are exact.
    /// </summary>
    static int CalendarMonths(TimeUnits units) =>
        units.Calendar == CfCalendar.Day360 ? 0 : units.UnitName switch
        {
            "months" or "month" => 1,
            "years" or "year" or "yr" or "yrs" => 12,
            _ => 0,
        };

    /// <summary>The reference moved by whole calendar months; a day beyond the target month's end becomes its last day.</summary>
    static CfTime AddMonths(CfTime reference, long months)
    {
        var (year, month, day) = reference.Date;
        long index = checked(year * 12 + (month - 1) + months);
        long y = (long)Math.Floor(index / 12.0);
        int m = (int)(index - y * 12) + 1;
        int d = Math.Min(day, reference.Calendar.DaysInMonth(y, m));
        return CfTime.Of(reference.Calendar, y, m, d, reference.Hour, reference.Minute, reference.Second);
    }
}
