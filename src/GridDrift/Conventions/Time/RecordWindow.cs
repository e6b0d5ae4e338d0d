namespace GridDrift.Conventions.Time;

/// <summary>
/// The part of a record to read, as an ISO 8601 interval START/END in the record's own calendar:
/// START included, END excluded, either end open as "..", each a year (2031), a month (2031-03),
/// a day or a date and time (2031-03-01T06:00). "2031-03/2031-04" is March 2031;
/// "2031-03-01/.." everything from 1 March 2031.
/// </summary>
public sealed record RecordWindow(string Text, string? Start, string? End)
{
    public static RecordWindow Parse(string text)
    {
        var parts = text.Split('/');
        if (parts.Length != 2) throw new FormatException($"'{text}' is not START/END (e.g. 2031-03-01/2031-06-01, 2031/.., ../2032)");
        string? start = Open(parts[0]), end = Open(parts[1]);
        if (start is null && end is null) throw new FormatException($"'{text}': at least one end must be a date");
        // the shape of each end is checked now; whether the date exists depends on the record's calendar, known later
        var a = start is null ? (CfTime?)null : Shaped(start);
        var b = end is null ? (CfTime?)null : Shaped(end);
        if (a is { } x && b is { } y && y <= x) throw new FormatException($"'{text}': the end does not come after the start");
        return new RecordWindow(text, start, end);
    }

    static CfTime Shaped(string end)
    {
        try { return Bound(end, CfCalendar.AllLeap); }
        catch (FormatException) { return Bound(end, CfCalendar.Day360); }
    }

    static string? Open(string end) => end.Trim() is ".." or "" ? null : end.Trim();

    /// <summary>The window's ends in <paramref name="calendar"/> (null where open); a date the calendar lacks is refused.</summary>
    public (CfTime? Start, CfTime? End) In(CfCalendar calendar) =>
        (Start is null ? null : Bound(Start, calendar), End is null ? null : Bound(End, calendar));

    public bool Contains(CfTime t, (CfTime? Start, CfTime? End) bounds) =>
        (bounds.Start is not { } s || t >= s) && (bounds.End is not { } e || t < e);

    static CfTime Bound(string text, CfCalendar calendar)
    {
        var pieces = text.Split('-');
        if (pieces.Length == 1 && pieces[0].All(char.IsAsciiDigit) && pieces[0].Length is > 0 and <= 6) text += "-01-01";
        else if (pieces.Length == 2 && pieces.All(p => p.Length > 0 && p.All(char.IsAsciiDigit))) text += "-01";
        try { return TimeUnits.ParseDate(text, calendar); }
        catch (FormatException e) { throw new FormatException($"'{text}' in the {calendar.CfName()} calendar: {e.Message}"); }
    }
}
