using GridDrift.Conventions.Time;
using GridDrift.Frames;

namespace GridDrift.Operators.Climatology;

/// <summary>The base period of a climatology: the one asked for, else the whole record.</summary>
internal static class BasePeriods
{
    /// <summary>--base, else the whole record: its first time up to one step past its last.</summary>
    public static TimePeriod Resolve(FrameSource source, string? text)
    {
        if (text is not null)
            try { return TimePeriod.Parse(text, source.Calendar); }
            catch (FormatException e) { throw new BadInputException(null, null, "--base " + e.Message); }
        var last = source.Times[^1];
        var end = source.Step switch
        {
            { IsCalendarMonths: true } s => NextMonths(last, s.Months),
            { Micros: > 0 } s => last.AddMicros(s.Micros),
            _ => last.AddMicros(1),
        };
        return new TimePeriod(source.Times[0], end);
    }

    static CfTime NextMonths(CfTime t, int months)
    {
        long m = t.Month - 1 + months;
        return CfTime.Of(t.Calendar, t.Year + m / 12, (int)(m % 12) + 1, 1);
    }
}
