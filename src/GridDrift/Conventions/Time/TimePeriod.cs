using System.Globalization;

namespace GridDrift.Conventions.Time;

/// <summary>
/// A half-open period [Start, End) written as ISO 8601 START/END, where each end may be a year
/// (2031), a month (2031-06), a day (2031-06-15) or a date and time. END names the last period
/// included: "1991/2020" runs from 1991-01-01 up to, not including, 2021-01-01.
/// </summary>
public readonly record struct TimePeriod(CfTime Start, CfTime End)
{
    public static TimePeriod Parse(string text, CfCalendar calendar)
    {
        var parts = text.Split('/');
        if (parts.Length != 2) throw new FormatException($"'{text}' is not START/END (e.g. 1991/2020 or 2031-01-01/2033-12-31)");
        var start = Bound(parts[0], calendar, after: false);
        var end = Bound(parts[1], calendar, after: true);
        if (end <= start) throw new FormatException($"'{text}': the end comes before the start");
        return new TimePeriod(start, end);
    }

    static CfTime Bound(string text, CfCalendar calendar, bool after)
    {
        text = text.Trim();
        var pieces = text.Split('-');
        bool dateOnly = !text.Contains('T') && !text.Contains(' ') && !text.Contains(':');
        if (dateOnly && pieces.Length <= 3 && pieces.All(p => p.Length > 0 && p.All(char.IsAsciiDigit)))
        {
            long year = long.Parse(pieces[0], CultureInfo.InvariantCulture);
            int month = pieces.Length > 1 ? int.Parse(pieces[1], CultureInfo.InvariantCulture) : 1;
            int day = pieces.Length > 2 ? int.Parse(pieces[2], CultureInfo.InvariantCulture) : 1;
            if (month is < 1 or > 12 || day < 1 || day > calendar.DaysInMonth(year, month))
                throw new FormatException($"'{text}' is not a date of the {calendar.CfName()} calendar");
            if (!after) return CfTime.Of(calendar, year, month, day);
            return pieces.Length switch
            {
                1 => CfTime.Of(calendar, year + 1, 1, 1),
                2 => month == 12 ? CfTime.Of(calendar, year + 1, 1, 1) : CfTime.Of(calendar, year, month + 1, 1),
                _ => CfTime.Of(calendar, year, month, day).AddMicros(CfTime.MicrosPerDay),
            };
        }
        var t = TimeUnits.ParseDate(text, calendar);
        return after ? t.AddMicros(1) : t;
    }

    public bool Contains(CfTime t) => t >= Start && t < End;

    /// <summary>Length in years of the calendar (365.2425, 365, 366 or 360 days).</summary>
    public double Years => End.SecondsSince(Start) / 86400.0 / Start.Calendar.MeanYearDays();

    /// <summary>ISO 8601 interval of the included period, END shown as the last instant's day when whole days.</summary>
    public string ToIsoString() => $"{Start.ToIsoString()}/{End.ToIsoString()}";
}
