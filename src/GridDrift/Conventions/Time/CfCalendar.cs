namespace GridDrift.Conventions.Time;

/// <summary>The calendars of CF Conventions §4.4.1 (CF-1.12).</summary>
public enum CfCalendar
{
    /// <summary>"standard" / "gregorian": Julian before 1582-10-15, Gregorian from then on (mixed).</summary>
    Standard,
    ProlepticGregorian,
    Julian,
    /// <summary>"noleap" / "365_day".</summary>
    NoLeap,
    /// <summary>"all_leap" / "366_day".</summary>
    AllLeap,
    /// <summary>"360_day": twelve months of 30 days.</summary>
    Day360,
}

public static class CfCalendars
{
    /// <summary>Parses a CF calendar attribute (case-insensitive; absent means standard, CF §4.4.1).</summary>
    public static CfCalendar? Parse(string? name) => (name ?? "standard").Trim().ToLowerInvariant() switch
    {
        "standard" or "gregorian" or "" => CfCalendar.Standard,
        "proleptic_gregorian" => CfCalendar.ProlepticGregorian,
        "julian" => CfCalendar.Julian,
        "noleap" or "no_leap" or "365_day" => CfCalendar.NoLeap,
        "all_leap" or "366_day" => CfCalendar.AllLeap,
        "360_day" => CfCalendar.Day360,
        _ => null,
    };

    public static string CfName(this CfCalendar c) => c switch
    {
        CfCalendar.Standard => "standard",
        CfCalendar.ProlepticGregorian => "proleptic_gregorian",
        CfCalendar.Julian => "julian",
        CfCalendar.NoLeap => "noleap",
        CfCalendar.AllLeap => "all_leap",
        _ => "360_day",
    };

    /// <summary>Calendars whose dates name real-world instants (a UTC timestamp exists).</summary>
    public static bool IsRealWorld(this CfCalendar c) =>
        c is CfCalendar.Standard or CfCalendar.ProlepticGregorian or CfCalendar.Julian;

    static bool GregorianLeap(long y) => (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    static bool JulianLeap(long y) => y % 4 == 0;

    public static bool IsLeapYear(this CfCalendar c, long year) => c switch
    {
        CfCalendar.ProlepticGregorian => GregorianLeap(year),
        CfCalendar.Julian => JulianLeap(year),
        CfCalendar.Standard => year < 1583 ? JulianLeap(year) : GregorianLeap(year),
        CfCalendar.AllLeap => true,
        _ => false,
    };

    static readonly int[] CommonMonths = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

    public static int DaysInMonth(this CfCalendar c, long year, int month)
    {
        if (month < 1 || month > 12) throw new ArgumentOutOfRangeException(nameof(month));
        if (c == CfCalendar.Day360) return 30;
        if (month == 2 && c.IsLeapYear(year)) return 29;
        if (c == CfCalendar.Standard && year == 1582 && month == 10) return 21; // 5 … 14 October never happened
        return CommonMonths[month - 1];
    }

    /// <summary>Mean length of the calendar's year in days: 360, 365, 366, 365.25 (julian) or 365.2425 (Gregorian).</summary>
    public static double MeanYearDays(this CfCalendar c) => c switch
    {
        CfCalendar.Day360 => 360.0,
        CfCalendar.NoLeap => 365.0,
        CfCalendar.AllLeap => 366.0,
        CfCalendar.Julian => 365.25,
        _ => 365.2425,
    };

    public static int DaysInYear(this CfCalendar c, long year) => c switch
    {
        CfCalendar.Day360 => 360,
        CfCalendar.NoLeap => 365,
        CfCalendar.AllLeap => 366,
        CfCalendar.Standard when year == 1582 => 355,
        _ => c.IsLeapYear(year) ? 366 : 365,
    };

    /// <summary>
    /// Day number of a date: for the real-world calendars the Julian Day Number at noon (JDN),
    /// for the idealised calendars days since their own 0001-01-01. Throws for dates the
    /// calendar does not have (30 February; 1582-10-05 … 14 in the standard calendar).
    /// </summary>
    public static long DayNumber(this CfCalendar c, long year, int month, int day)
    {
        if (month < 1 || month > 12 || day < 1 || day > (c == CfCalendar.Standard && year == 1582 && month == 10 ? 31 : c.DaysInMonth(year, month)))
            throw new ArgumentOutOfRangeException(nameof(day), $"{year:D4}-{month:D2}-{day:D2} does not exist in the {c.CfName()} calendar");
        switch (c)
        {
            case CfCalendar.ProlepticGregorian: return GregorianJdn(year, month, day);
            case CfCalendar.Julian: return JulianJdn(year, month, day);
            case CfCalendar.Standard:
                if (year < 1582 || (year == 1582 && (month < 10 || (month == 10 && day <= 4)))) return JulianJdn(year, month, day);
                if (year == 1582 && month == 10 && day < 15)
                    throw new ArgumentOutOfRangeException(nameof(day), $"1582-10-{day:D2} does not exist in the standard calendar (the Gregorian reform skipped 5 to 14 October)");
                return GregorianJdn(year, month, day);
            case CfCalendar.Day360: return (year - 1) * 360 + (month - 1) * 30 + (day - 1);
            default:
                int fixedLength = c == CfCalendar.NoLeap ? 365 : 366;
                long d = (year - 1) * fixedLength;
                for (int m = 1; m < month; m++) d += c.DaysInMonth(year, m);
                return d + day - 1;
        }
    }

    /// <summary>The inverse of <see cref="DayNumber"/>.</summary>
    public static (long Year, int Month, int Day) Date(this CfCalendar c, long dayNumber)
    {
        switch (c)
        {
            case CfCalendar.ProlepticGregorian: return GregorianFromJdn(dayNumber);
            case CfCalendar.Julian: return JulianFromJdn(dayNumber);
            case CfCalendar.Standard: return dayNumber >= GregorianReformJdn ? GregorianFromJdn(dayNumber) : JulianFromJdn(dayNumber);
            case CfCalendar.Day360:
            {
                long year = FloorDiv(dayNumber, 360);
                long rest = dayNumber - year * 360;
                return (year + 1, (int)(rest / 30) + 1, (int)(rest % 30) + 1);
            }
            default:
            {
                int fixedLength = c == CfCalendar.NoLeap ? 365 : 366;
                long year = FloorDiv(dayNumber, fixedLength);
                int rest = (int)(dayNumber - year * fixedLength);
                int month = 1;
                while (rest >= c.DaysInMonth(year + 1, month)) rest -= c.DaysInMonth(year + 1, month++);
                return (year + 1, month, rest + 1);
            }
        }
    }

    /// <summary>JDN of 1582-10-15 (Gregorian), the first day of the reformed calendar.</summary>
    public const long GregorianReformJdn = 2299161;

    static long FloorDiv(long a, long b) => a >= 0 ? a / b : -((-a + b - 1) / b);

    // The integer Julian Day Number conversions of Fliegel & Van Flandern (1968, Communications of
    // the ACM 11(10): 657) and their Julian-calendar counterpart, written with floor division so
    // that years ≤ 0 (astronomical numbering) work too.
    static long GregorianJdn(long y, int m, int d)
    {
        long a = FloorDiv(14 - m, 12);
        long yy = y + 4800 - a;
        long mm = m + 12 * a - 3;
        return d + FloorDiv(153 * mm + 2, 5) + 365 * yy + FloorDiv(yy, 4) - FloorDiv(yy, 100) + FloorDiv(yy, 400) - 32045;
    }

    static long JulianJdn(long y, int m, int d)
    {
        long a = FloorDiv(14 - m, 12);
        long yy = y + 4800 - a;
        long mm = m + 12 * a - 3;
        return d + FloorDiv(153 * mm + 2, 5) + 365 * yy + FloorDiv(yy, 4) - 32083;
    }

    static (long, int, int) GregorianFromJdn(long jdn)
    {
        long a = jdn + 32044;
        long b = FloorDiv(4 * a + 3, 146097);
        long c = a - FloorDiv(146097 * b, 4);
        long d = FloorDiv(4 * c + 3, 1461);
        long e = c - FloorDiv(1461 * d, 4);
        long m = FloorDiv(5 * e + 2, 153);
        int day = (int)(e - FloorDiv(153 * m + 2, 5) + 1);
        int month = (int)(m + 3 - 12 * FloorDiv(m, 10));
        long year = 100 * b + d - 4800 + FloorDiv(m, 10);
        return (year, month, day);
    }

    static (long, int, int) JulianFromJdn(long jdn)
    {
        long c = jdn + 32082;
        long d = FloorDiv(4 * c + 3, 1461);
        long e = c - FloorDiv(1461 * d, 4);
        long m = FloorDiv(5 * e + 2, 153);
        int day = (int)(e - FloorDiv(153 * m + 2, 5) + 1);
        int month = (int)(m + 3 - 12 * FloorDiv(m, 10));
        long year = d - 4800 + FloorDiv(m, 10);
        return (year, month, day);
    }
}
