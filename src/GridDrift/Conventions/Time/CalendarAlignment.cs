namespace GridDrift.Conventions.Time;

/// <summary>
/// Moves model times onto the standard calendar for a comparison, by date: a noleap or all_leap
/// time keeps its year, month, day and time of day. Every noleap date exists in the standard
/// calendar (standard 29 February then has no model value); an all_leap 29 February in a year
/// that is not leap has no standard date and its frame is dropped (and counted). 360_day dates
/// (30 February) cannot keep their dates and are refused rather than silently shifted.
/// </summary>
internal static class CalendarAlignment
{
    public static bool CanAlign(CfCalendar from, CfCalendar to) =>
        from == to || (to is CfCalendar.Standard or CfCalendar.ProlepticGregorian && from is CfCalendar.NoLeap or CfCalendar.AllLeap or CfCalendar.Standard or CfCalendar.ProlepticGregorian);

    /// <summary>The same date and time of day in the target calendar, or null where that date does not exist there.</summary>
    public static CfTime? Align(CfTime t, CfCalendar to)
    {
        if (t.Calendar == to) return t;
        var (y, m, d) = t.Date;
        if (d > to.DaysInMonth(y, m)) return null;
        return new CfTime(to, to.DayNumber(y, m, d) * CfTime.MicrosPerDay + t.MicrosOfDay);
    }
}
