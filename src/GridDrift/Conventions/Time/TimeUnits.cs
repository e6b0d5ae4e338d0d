using System.Globalization;
using System.Text.RegularExpressions;

namespace GridDrift.Conventions.Time;

/// <summary>
/// A CF time unit "UNIT since REFERENCE" (CF Conventions §4.4) in a calendar: decodes numeric
/// time values into <see cref="CfTime"/> and encodes them back. UNIT is any UDUNITS spelling of
/// microseconds … days; "months" and "years" follow UDUNITS (a year is 365.242198781 days, a
/// month one twelfth of it), as CF prescribes, except in 360_day, where they are 30 and 360 days.
/// </summary>
public sealed partial class TimeUnits
{
    public CfCalendar Calendar { get; }
    public CfTime Reference { get; }
    public double MicrosPerUnit { get; }
    public string UnitName { get; }
    public string Text { get; }

    TimeUnits(string text, CfCalendar calendar, CfTime reference, double microsPerUnit, string unitName)
    {
        Text = text;
        Calendar = calendar;
        Reference = reference;
        MicrosPerUnit = microsPerUnit;
        UnitName = unitName;
    }

    [GeneratedRegex(@"^\s*(?<unit>[A-Za-z_]+)\s+(?<kw>since|after|from|ref)\s+(?<ref>.+?)\s*$", RegexOptions.IgnoreCase)]
    private static partial Regex UnitsPattern();

    [GeneratedRegex(@"^(?<y>[+-]?\d{1,6})-(?<mo>\d{1,2})(-(?<d>\d{1,2}))?([T\s]+(?<h>\d{1,2})(:(?<mi>\d{1,2})(:(?<s>\d{1,2}(\.\d*)?))?)?)?\s*(?<tz>Z|UTC|GMT|[+-]\d{1,2}(:?\d{2})?)?$", RegexOptions.IgnoreCase)]
    private static partial Regex DatePattern();

    public static bool LooksLikeTime(string? units) =>
        units is not null && UnitsPattern().Match(units) is { Success: true } m &&
        m.Groups["kw"].Value.Equals("since", StringComparison.OrdinalIgnoreCase);

    /// <summary>Parses units such as "hours since 1979-01-01 00:00:00" or "days since 2000-1-1T00:00Z".</summary>
    public static TimeUnits Parse(string units, CfCalendar calendar)
    {
        var m = UnitsPattern().Match(units);
        if (!m.Success) throw new FormatException($"time units '{units}' are not of the form 'UNIT since REFERENCE'");
        string unit = m.Groups["unit"].Value.ToLowerInvariant();
        double micros = unit switch
        {
            "microseconds" or "microsecond" or "us" or "usec" or "usecs" => 1,
            "milliseconds" or "millisecond" or "ms" or "msec" or "msecs" => 1e3,
            "seconds" or "second" or "s" or "sec" or "secs" => 1e6,
            "minutes" or "minute" or "min" or "mins" => 60e6,
            "hours" or "hour" or "h" or "hr" or "hrs" => 3600e6,
            "days" or "day" or "d" => 86400e6,
            "weeks" or "week" => 7 * 86400e6,
            "months" or "month" => calendar == CfCalendar.Day360 ? 30 * 86400e6 : 365.242198781 / 12 * 86400e6,
            "years" or "year" or "yr" or "yrs" => calendar == CfCalendar.Day360 ? 360 * 86400e6 : 365.242198781 * 86400e6,
            _ => throw new FormatException($"'{unit}' is not a time unit (in '{units}')"),
        };
        var reference = ParseDate(m.Groups["ref"].Value, calendar);
        return new TimeUnits(units, calendar, reference, micros, unit);
    }

    /// <summary>Parses an ISO-8601-like date as CF and UDUNITS allow it (single-digit fields, a space for T, a zone offset).</summary>
    public static CfTime ParseDate(string text, CfCalendar calendar)
    {
        var m = DatePattern().Match(text.Trim());
        if (!m.Success) throw new FormatException($"'{text}' is not a reference date");
        long y = long.Parse(m.Groups["y"].Value, CultureInfo.InvariantCulture);
        int mo = int.Parse(m.Groups["mo"].Value, CultureInfo.InvariantCulture);
        int d = m.Groups["d"].Success ? int.Parse(m.Groups["d"].Value, CultureInfo.InvariantCulture) : 1;
        int h = m.Groups["h"].Success ? int.Parse(m.Groups["h"].Value, CultureInfo.InvariantCulture) : 0;
        int mi = m.Groups["mi"].Success ? int.Parse(m.Groups["mi"].Value, CultureInfo.InvariantCulture) : 0;
        double s = m.Groups["s"].Success ? double.Parse(m.Groups["s"].Value, CultureInfo.InvariantCulture) : 0;
        CfTime t;
        try
        {
            t = CfTime.Of(calendar, y, mo, d, h, mi, s);
        }
        catch (ArgumentOutOfRangeException e)
        {
            throw new FormatException($"reference date '{text}': {e.Message.Split(" (Parameter")[0]}");
        }
        if (m.Groups["tz"].Success && m.Groups["tz"].Value is var tz && tz.Length > 0 && char.IsDigit(tz[^1]))
        {
            // "+05:30" means local time five and a half hours ahead of UTC: subtract to get UTC.
            int sign = tz[0] == '-' ? -1 : 1;
            string digits = tz[1..].Replace(":", "");
            int hours = int.Parse(digits.Length <= 2 ? digits : digits[..^2], CultureInfo.InvariantCulture);
            int minutes = digits.Length > 2 ? int.Parse(digits[^2..], CultureInfo.InvariantCulture) : 0;
            t = t.AddMicros(-sign * (hours * 3600L + minutes * 60L) * CfTime.MicrosPerSecond);
        }
        return t;
    }

    public CfTime Decode(double value)
    {
        if (!double.IsFinite(value)) throw new ArgumentOutOfRangeException(nameof(value), "time value is not finite");
        return Reference.AddMicros((long)Math.Round(value * MicrosPerUnit));
    }

    public double Encode(CfTime time) => time.MicrosSince(Reference) / MicrosPerUnit;

    public override string ToString() => Text;
}
