namespace GridDrift.Conventions.Time;

/// <summary>
/// The regular step of a time record: a fixed duration (hourly, 3-hourly, daily …) or a calendar
/// month or year (monthly and yearly data have steps of varying length). Written as an ISO 8601
/// duration ("PT3H", "P1D", "P1M").
/// </summary>
internal readonly record struct TimeStep(long Micros, int Months)
{
    public bool IsCalendarMonths => Months > 0;

    /// <summary>Number of steps from <paramref name="a"/> to <paramref name="b"/> (1 when b follows a regularly).</summary>
    public double StepsBetween(CfTime a, CfTime b)
    {
        if (IsCalendarMonths)
        {
            long months = (b.Year - a.Year) * 12 + (b.Month - a.Month);
            bool aligned = a.Day == b.Day && a.MicrosOfDay == b.MicrosOfDay;
            return aligned ? (double)months / Months : months / (double)Months + 0.5; // misaligned: never exactly whole
        }
        return Micros == 0 ? double.NaN : b.MicrosSince(a) / (double)Micros;
    }

    /// <summary>The step of a record: calendar months if every interval is a whole number of months, else the most common interval.</summary>
    public static TimeStep? Infer(IReadOnlyList<CfTime> times)
    {
        if (times.Count < 2) return null;
        var monthDiffs = new List<long>();
        bool monthly = true;
        for (int i = 1; i < times.Count && monthly; i++)
        {
            var a = times[i - 1];
            var b = times[i];
            if (a.Day != b.Day || a.MicrosOfDay != b.MicrosOfDay) monthly = false;
            else monthDiffs.Add((b.Year - a.Year) * 12 + (b.Month - a.Month));
        }
        if (monthly && monthDiffs.Count > 0 && monthDiffs.All(m => m > 0))
        {
            long mode = monthDiffs.GroupBy(m => m).OrderByDescending(g => g.Count()).ThenBy(g => g.Key).First().Key;
            // Daily data whose days happen to repeat would not pass the day check; days only align here on monthly records.
            return new TimeStep(0, (int)mode);
        }
        var diffs = new Dictionary<long, int>();
        for (int i = 1; i < times.Count; i++)
        {
            long d = times[i].Micros - times[i - 1].Micros;
            diffs[d] = diffs.GetValueOrDefault(d) + 1;
        }
        long modal = diffs.OrderByDescending(p => p.Value).ThenBy(p => p.Key).First().Key;
        return new TimeStep(modal, 0);
    }

    public string ToIso8601()
    {
        if (IsCalendarMonths) return Months % 12 == 0 ? $"P{Months / 12}Y" : $"P{Months}M";
        long seconds = Micros / CfTime.MicrosPerSecond;
        long remainderMicros = Micros % CfTime.MicrosPerSecond;
        if (remainderMicros != 0 || seconds <= 0) return $"PT{Micros / 1e6:0.######}S";
        if (seconds % 86400 == 0) return $"P{seconds / 86400}D";
        var text = "PT";
        if (seconds >= 3600) { text += $"{seconds / 3600}H"; seconds %= 3600; }
        if (seconds >= 60) { text += $"{seconds / 60}M"; seconds %= 60; }
        if (seconds > 0) text += $"{seconds}S";
        return text;
    }

    public string Describe()
    {
        if (IsCalendarMonths) return Months == 1 ? "1 month" : Months % 12 == 0 ? $"{Months / 12} year(s)" : $"{Months} months";
        double s = Micros / 1e6;
        if (s % 86400 == 0) return $"{s / 86400:0} day(s)";
        if (s % 3600 == 0) return $"{s / 3600:0} h";
        if (s % 60 == 0) return $"{s / 60:0} min";
        return $"{s:0.###} s";
    }
}
