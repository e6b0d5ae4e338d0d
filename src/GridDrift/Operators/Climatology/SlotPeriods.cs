using GridDrift.Conventions.Time;

namespace GridDrift.Operators.Climatology;

/// <summary>The slot times and climatological bounds of each slot (CF Conventions §7.4).</summary>
internal sealed record SlotTimes(CfTime[] Times, CfTime[] BoundsStart, CfTime[] BoundsEnd);

/// <summary>
/// The time coordinate and climatological bounds of each slot, from the samples that filled it:
/// a month slot runs from the first of the month in the year of its first sample to the first of
/// the next month in the year of its last; a day slot from the start of its first sample's day to
/// the end of its last sample's day; a diurnal slot from its first sample's time to its last
/// sample's time plus the record's step. The slot's time is the middle of its first period (the
/// first sample's time for diurnal slots). A slot without samples gets its nominal period in the
/// first year of the base period, zero-length.
/// </summary>
internal static class SlotPeriods
{
    public static SlotTimes From(SlotScheme scheme, IReadOnlyList<CfTime> samples, TimePeriod basePeriod, TimeStep? step)
    {
        int n = scheme.SlotCount;
        var first = new CfTime?[n];
        var last = new CfTime?[n];
        foreach (var t in samples)
        {
            int s = scheme.SlotOf(t);
            if (s < 0) continue;
            first[s] ??= t;
            last[s] = t;
        }
        var cal = scheme.Calendar;
        var times = new CfTime[n];
        var starts = new CfTime[n];
        var ends = new CfTime[n];
        for (int s = 0; s < n; s++)
        {
            var (month, day, timeOfDay) = scheme.Describe(s);
            if (first[s] is not { } a || last[s] is not { } z)
            {
                var nominal = Nominal(scheme, s, basePeriod.Start.Year);
                times[s] = starts[s] = ends[s] = nominal;
                continue;
            }
            switch (scheme.Kind)
            {
                case ClimatologyKind.Month:
                    starts[s] = CfTime.Of(cal, a.Year, month, 1);
                    ends[s] = NextMonth(cal, z.Year, month);
                    times[s] = Middle(starts[s], NextMonth(cal, a.Year, month));
                    break;
                case ClimatologyKind.DayOfYear:
                    starts[s] = new CfTime(cal, a.DayNumber * CfTime.MicrosPerDay);
                    ends[s] = new CfTime(cal, (z.DayNumber + 1) * CfTime.MicrosPerDay);
                    times[s] = starts[s].AddMicros(CfTime.MicrosPerDay / 2);
                    break;
                default:
                    starts[s] = a;
                    ends[s] = step is { IsCalendarMonths: false, Micros: > 0 } st ? z.AddMicros(st.Micros) : z;
                    times[s] = a;
                    break;
            }
        }
        return new SlotTimes(times, starts, ends);
    }

    static CfTime NextMonth(CfCalendar cal, long year, int month) => month == 12 ? CfTime.Of(cal, year + 1, 1, 1) : CfTime.Of(cal, year, month + 1, 1);

    static CfTime Middle(CfTime a, CfTime b) => a.AddMicros(b.MicrosSince(a) / 2);

    static CfTime Nominal(SlotScheme scheme, int slot, long year)
    {
        var (month, day, timeOfDay) = scheme.Describe(slot);
        var cal = scheme.Calendar;
        if (day == 0) return CfTime.Of(cal, year, month, 1).AddMicros(timeOfDay);
        for (long y = year; y < year + 8; y++)
            if (day <= cal.DaysInMonth(y, month)) return CfTime.Of(cal, y, month, day);
        return CfTime.Of(cal, year, month, 1);
    }
}
