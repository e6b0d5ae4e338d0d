namespace GridDrift.Operators.Climatology;

/// <summary>How a climatology divides the year (and the day) into slots.</summary>
public enum ClimatologyKind
{
    /// <summary>Twelve calendar months.</summary>
    Month,
    /// <summary>One slot per day of the calendar's year (360, 365 or 366; see <see cref="SlotScheme"/>).</summary>
    DayOfYear,
    /// <summary>The diurnal cycle of each month: month × time of day, for sub-daily data.</summary>
    HourByMonth,
}

public static class ClimatologyKinds
{
    public static string Name(this ClimatologyKind k) => k switch
    {
        ClimatologyKind.Month => "month",
        ClimatologyKind.DayOfYear => "day-of-year",
        _ => "hour-by-month",
    };

    public static ClimatologyKind? Parse(string text) => text.Trim().ToLowerInvariant() switch
    {
        "month" => ClimatologyKind.Month,
        "day-of-year" => ClimatologyKind.DayOfYear,
        "hour-by-month" => ClimatologyKind.HourByMonth,
        _ => null,
    };
}
