using GridDrift.Conventions.Time;

namespace GridDrift.Tests.Conventions;

/// <summary>Calendar facts from CF Conventions §4.4.1 (CF-1.12) and the Gregorian reform of 1582.</summary>
public class CalendarFactsTests
{
    [Fact]
    public void A_360_day_year_has_twelve_months_of_thirty_days()
    {
        // CF §4.4.1: "360_day: All years are 360 days divided into 30 day months."
        var c = CfCalendar.Day360;
        Assert.All(Enumerable.Range(1, 12), m => Assert.Equal(30, c.DaysInMonth(2031, m)));
        Assert.Equal(360, c.DaysInYear(2031));
        var feb30 = CfTime.Of(c, 2001, 2, 30);
        Assert.Equal("2001-02-30T00:00:00", feb30.ToIsoString());
        Assert.Equal("2001-03-01T00:00:00", feb30.AddSeconds(86400).ToIsoString());
    }

    [Fact]
    public void Noleap_has_no_29_February()
    {
        // CF §4.4.1: "noleap / 365_day: Gregorian calendar without leap years, i.e., all years are 365 days long."
        Assert.Throws<ArgumentOutOfRangeException>(() => CfTime.Of(CfCalendar.NoLeap, 2000, 2, 29));
        Assert.Equal("2000-03-01T00:00:00", CfTime.Of(CfCalendar.NoLeap, 2000, 2, 28).AddSeconds(86400).ToIsoString());
        Assert.Equal(365, CfCalendar.NoLeap.DaysInYear(2000));
    }

    [Fact]
    public void All_leap_has_29_February_every_year()
    {
        Assert.Equal(29, CfCalendar.AllLeap.DaysInMonth(2031, 2));
        Assert.Equal(366, CfCalendar.AllLeap.DaysInYear(1900));
    }

    [Fact]
    public void In_the_standard_calendar_4_October_1582_is_followed_by_15_October()
    {
        // The Gregorian reform (papal bull Inter gravissimas, 1582); CF §4.4.1 "standard: mixed Gregorian/Julian".
        var oct4 = CfTime.Of(CfCalendar.Standard, 1582, 10, 4);
        Assert.Equal("1582-10-15T00:00:00", oct4.AddSeconds(86400).ToIsoString());
        Assert.Throws<ArgumentOutOfRangeException>(() => CfTime.Of(CfCalendar.Standard, 1582, 10, 10));
        // proleptic_gregorian and julian have those days
        Assert.Equal("1582-10-05T00:00:00", CfTime.Of(CfCalendar.ProlepticGregorian, 1582, 10, 4).AddSeconds(86400).ToIsoString());
        Assert.Equal("1582-10-05T00:00:00", CfTime.Of(CfCalendar.Julian, 1582, 10, 4).AddSeconds(86400).ToIsoString());
    }

    [Fact]
    public void Leap_years_follow_the_Julian_rule_before_the_reform_and_the_Gregorian_rule_after()
    {
        // 1500 is a leap year in the Julian calendar (divisible by 4), 1900 is not in the Gregorian (century not divisible by 400).
        Assert.True(CfCalendar.Standard.IsLeapYear(1500));
        Assert.False(CfCalendar.Standard.IsLeapYear(1900));
        Assert.True(CfCalendar.Standard.IsLeapYear(2000));
        Assert.True(CfCalendar.Julian.IsLeapYear(1900));
        Assert.False(CfCalendar.ProlepticGregorian.IsLeapYear(1500));
    }

    [Fact]
    public void The_Julian_day_number_of_2000_01_01_is_2451545()
    {
        // J2000.0 epoch: JD 2451545.0 at 2000-01-01 12:00 TT (IAU); the day's integer JDN is 2451545.
        Assert.Equal(2451545, CfCalendar.ProlepticGregorian.DayNumber(2000, 1, 1));
        Assert.Equal(2451545, CfCalendar.Standard.DayNumber(2000, 1, 1));
    }

    [Fact]
    public void Real_world_calendars_give_UTC_and_model_calendars_do_not()
    {
        Assert.Equal(new DateTime(2031, 3, 4, 5, 0, 0, DateTimeKind.Utc), CfTime.Of(CfCalendar.Standard, 2031, 3, 4, 5).ToUtc());
        Assert.Null(CfTime.Of(CfCalendar.Day360, 2031, 3, 4).ToUtc());
        Assert.Null(CfTime.Of(CfCalendar.NoLeap, 2031, 3, 4).ToUtc());
    }
}
