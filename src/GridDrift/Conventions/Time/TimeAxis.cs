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
        for (int i = 0; i < raw.Length; i++)
        {
            double value = raw[i] * codec.Scale + codec.Offset;
            if (!double.IsFinite(value) || Math.Abs(value * parsed.MicrosPerUnit) > 9e18)
                throw new BadInputException(reader.Path, variable.Name, $"time value at index {i} ({raw[i]}) is missing or out of range");
            times[i] = parsed.Decode(value);
        }
        return new TimeAxis
        {
            VariableName = variable.Name,
            Units = parsed,
            Times = times,
            RawValues = raw,
            CalendarAttribute = calendarText,
        };
    }
}
