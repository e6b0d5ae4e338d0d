using System.Globalization;

namespace GridDrift.Conventions.Time;

/// <summary>
/// An instant in a CF calendar: the one time type every GridDrift stage speaks (never
/// System.DateTime, which knows one calendar only). Stored as whole microseconds from the
/// start of the calendar's day number 0, so differences and ordering are exact integers.
/// </summary>
public readonly struct CfTime : IComparable<CfTime>, IEquatable<CfTime>
{
    public const long MicrosPerSecond = 1_000_000;
    public const long MicrosPerDay = 86_400 * MicrosPerSecond;

    public CfCalendar Calendar { get; }
    /// <summary>Microseconds since the start of day number 0 of <see cref="Calendar"/>.</summary>
    public long Micros { get; }

    public CfTime(CfCalendar calendar, long micros)
    {
        Calendar = calendar;
        Micros = micros;
    }

    public static CfTime Of(CfCalendar calendar, long year, int month, int day, int hour = 0, int minute = 0, double second = 0)
    {
        if (hour < 0 || hour > 23 || minute < 0 || minute > 59 || second < 0 || second >= 61)
            throw new ArgumentOutOfRangeException(nameof(hour), $"time of day {hour:D2}:{minute:D2}:{second} is invalid");
        long dayNumber = calendar.DayNumber(year, month, day);
        long micros = checked(dayNumber * MicrosPerDay + (hour * 3600L + minute * 60L) * MicrosPerSecond + (long)Math.Round(second * MicrosPerSecond));
        return new CfTime(calendar, micros);
    }

    public long DayNumber => Micros >= 0 ? Micros / MicrosPerDay : -((-Micros + MicrosPerDay - 1) / MicrosPerDay);
    public long MicrosOfDay => Micros - DayNumber * MicrosPerDay;

    public (long Year, int Month, int Day) Date => Calendar.Date(DayNumber);
    public long Year => Date.Year;
    public int Month => Date.Month;
    public int Day => Date.Day;
    public int Hour => (int)(MicrosOfDay / (3600 * MicrosPerSecond));
    public int Minute => (int)(MicrosOfDay / (60 * MicrosPerSecond) % 60);
    public double Second => MicrosOfDay % (60 * MicrosPerSecond) / (double)MicrosPerSecond;

    /// <summary>Day of the year, from 1.</summary>
    public int DayOfYear => (int)(DayNumber - Calendar.DayNumber(Year, 1, 1) + 1);

    public CfTime AddMicros(long micros) => new(Calendar, checked(Micros + micros));
    public CfTime AddSeconds(double seconds) => AddMicros((long)Math.Round(seconds * MicrosPerSecond));

    /// <summary>Seconds from <paramref name="earlier"/> to this instant (same calendar).</summary>
    public double SecondsSince(CfTime earlier)
    {
        RequireSameCalendar(earlier);
        return (Micros - earlier.Micros) / (double)MicrosPerSecond;
    }

    public long MicrosSince(CfTime earlier)
    {
        RequireSameCalendar(earlier);
        return Micros - earlier.Micros;
    }

    void RequireSameCalendar(CfTime other)
    {
        if (other.Calendar != Calendar)
            throw new InvalidOperationException($"cannot compare a {Calendar.CfName()} time with a {other.Calendar.CfName()} time");
    }

    /// <summary>ISO 8601 text in the calendar's own reckoning to the whole second, e.g. 2001-02-30T00:00:00 in 360_day.</summary>
    public string ToIsoString()
    {
        var (y, m, d) = Date;
        // Fractions of a second are cut, not rounded, as strftime does: the text never names a later second.
        long secondsOfDay = MicrosOfDay / MicrosPerSecond;
        string year = y is >= 0 and <= 9999 ? y.ToString("D4", CultureInfo.InvariantCulture) : y.ToString(CultureInfo.InvariantCulture);
        return string.Create(CultureInfo.InvariantCulture,
            $"{year}-{m:D2}-{d:D2}T{secondsOfDay / 3600:D2}:{secondsOfDay / 60 % 60:D2}:{secondsOfDay % 60:D2}");
    }

    /// <summary>The UTC instant for real-world calendars in DateTime's range; null otherwise.</summary>
    public DateTime? ToUtc()
    {
        if (!Calendar.IsRealWorld()) return null;
        // Day numbers of all three real-world calendars are Julian Day Numbers: one instant, one number.
        long jdn = DayNumber;
        const long jdnOfDateTimeZero = 1721426; // 0001-01-01 proleptic Gregorian
        long days = jdn - jdnOfDateTimeZero;
        if (days < 0 || days >= 3_652_059) return null;
        return new DateTime(days * TimeSpan.TicksPerDay + MicrosOfDay * 10, DateTimeKind.Utc);
    }

    public int CompareTo(CfTime other) => Micros.CompareTo(other.Micros);
    public bool Equals(CfTime other) => Calendar == other.Calendar && Micros == other.Micros;
    public override bool Equals(object? obj) => obj is CfTime t && Equals(t);
    public override int GetHashCode() => HashCode.Combine(Calendar, Micros);
    public static bool operator ==(CfTime a, CfTime b) => a.Equals(b);
    public static bool operator !=(CfTime a, CfTime b) => !a.Equals(b);
    public static bool operator <(CfTime a, CfTime b) => a.Micros < b.Micros;
    public static bool operator >(CfTime a, CfTime b) => a.Micros > b.Micros;
    public static bool operator <=(CfTime a, CfTime b) => a.Micros <= b.Micros;
    public static bool operator >=(CfTime a, CfTime b) => a.Micros >= b.Micros;
    public override string ToString() => ToIsoString();
}
