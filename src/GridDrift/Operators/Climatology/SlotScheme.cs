using GridDrift.Conventions.Time;

namespace GridDrift.Operators.Climatology;

/// <summary>
/// Maps a time to its climatology slot.
/// <list type="bullet">
/// <item>month: slot = month − 1 (12 slots).</item>
/// <item>day-of-year: the slot count follows the calendar: 360 for 360_day, 365 for noleap,
/// 366 for all_leap. Calendars with leap years (standard, proleptic_gregorian, julian) get 366
/// slots keyed by month and day as in a leap year: 29 February has a slot of its own, filled
/// only by leap years, and 1 March is slot 60 (0-based) in every year, so a date keeps its
/// slot whether or not its year is a leap year.</item>
/// <item>hour-by-month: slot = (month − 1) × T + k, where the T times of day are those present
/// in the data (24 for hourly data, 8 for three-hourly), sorted.</item>
/// </list>
/// </summary>
internal sealed class SlotScheme
{
    static readonly int[] LeapMonthStart = [0, 31, 60, 91, 121, 152, 182, 213, 244, 274, 305, 335];

    public ClimatologyKind Kind { get; }
    public CfCalendar Calendar { get; }
    public int SlotCount { get; }
    /// <summary>For hour-by-month: the times of day (microseconds after midnight), sorted.</summary>
    public IReadOnlyList<long> TimesOfDay { get; }
    readonly Dictionary<long, int> _timeOfDayIndex;

    SlotScheme(ClimatologyKind kind, CfCalendar calendar, IReadOnlyList<long> timesOfDay)
    {
        Kind = kind;
        Calendar = calendar;
        TimesOfDay = timesOfDay;
        _timeOfDayIndex = timesOfDay.Select((t, i) => (t, i)).ToDictionary(p => p.t, p => p.i);
        SlotCount = kind switch
        {
            ClimatologyKind.Month => 12,
            ClimatologyKind.DayOfYear => DaysInSlotYear(calendar),
            _ => 12 * timesOfDay.Count,
        };
    }

    public static SlotScheme Months(CfCalendar calendar) => new(ClimatologyKind.Month, calendar, []);
    public static SlotScheme DaysOfYear(CfCalendar calendar) => new(ClimatologyKind.DayOfYear, calendar, []);

    /// <summary>The diurnal scheme over the given times of day (microseconds after midnight).</summary>
    public static SlotScheme HoursByMonth(CfCalendar calendar, IEnumerable<long> timesOfDay) =>
        new(ClimatologyKind.HourByMonth, calendar, timesOfDay.Distinct().Order().ToArray());

    public static SlotScheme For(ClimatologyKind kind, CfCalendar calendar, IEnumerable<CfTime> times) => kind switch
    {
        ClimatologyKind.Month => Months(calendar),
        ClimatologyKind.DayOfYear => DaysOfYear(calendar),
        _ => HoursByMonth(calendar, times.Select(t => t.MicrosOfDay)),
    };

    static int DaysInSlotYear(CfCalendar c) => c switch
    {
        CfCalendar.Day360 => 360,
        CfCalendar.NoLeap => 365,
        _ => 366,
    };

    /// <summary>The slot of a time, or −1 when the scheme has none for it (a time of day the diurnal scheme does not hold).</summary>
    public int SlotOf(CfTime time)
    {
        var (_, month, day) = time.Date;
        switch (Kind)
        {
            case ClimatologyKind.Month:
                return month - 1;
            case ClimatologyKind.DayOfYear:
                return Calendar switch
                {
                    CfCalendar.Day360 => (month - 1) * 30 + day - 1,
                    CfCalendar.NoLeap or CfCalendar.AllLeap => time.DayOfYear - 1,
                    _ => LeapMonthStart[month - 1] + day - 1,
                };
            default:
                return _timeOfDayIndex.TryGetValue(time.MicrosOfDay, out int k) ? (month - 1) * TimesOfDay.Count + k : -1;
        }
    }

    /// <summary>Month (1–12) and day (1–31, as in a leap year for day-of-year) of a slot; day 0 for month slots.</summary>
    public (int Month, int Day, long TimeOfDay) Describe(int slot)
    {
        switch (Kind)
        {
            case ClimatologyKind.Month: return (slot + 1, 0, 0);
            case ClimatologyKind.HourByMonth: return (slot / TimesOfDay.Count + 1, 0, TimesOfDay[slot % TimesOfDay.Count]);
        }
        if (Calendar == CfCalendar.Day360) return (slot / 30 + 1, slot % 30 + 1, 0);
        if (Calendar is CfCalendar.NoLeap or CfCalendar.AllLeap)
        {
            var (_, m, d) = Calendar.Date(Calendar.DayNumber(Calendar == CfCalendar.NoLeap ? 2001 : 2000, 1, 1) + slot);
            return (m, d, 0);
        }
        int month = Array.FindLastIndex(LeapMonthStart, s => s <= slot) + 1;
        return (month, slot - LeapMonthStart[month - 1] + 1, 0);
    }
}
