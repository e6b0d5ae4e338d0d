using CsCheck;
using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Pipeline;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Climatology;

/// <summary>
/// The methods behind the climatology: Welford moments merged by Chan et al., the calendar's
/// slots, the harmonic and window smoothers against a known annual sinusoid, and the base-period
/// rules (WMO-No. 1203 standard normals of 30 years).
/// </summary>
public class ClimatologyMethodTests
{
    [Fact]
    public void Two_partial_states_of_disjoint_periods_merge_into_the_state_of_both()
    {
        // Chan, Golub & LeVeque (1983): merging is exact in real arithmetic; in float64 it agrees to rounding (1e-12 relative).
        Gen.Select(Gen.Double[-50, 350].Array[1, 60], Gen.Double[-50, 350].Array[0, 60], Gen.Double[0, 1e4])
            .Sample((first, second, offset) =>
            {
                var a = new MomentState(1, 1);
                var b = new MomentState(1, 1);
                var all = new MomentState(1, 1);
                foreach (var x in first) { a.Add(0, 0, [(float)(x + offset)]); all.Add(0, 0, [(float)(x + offset)]); }
                foreach (var x in second) { b.Add(0, 0, [(float)(x + offset)]); all.Add(0, 0, [(float)(x + offset)]); }
                a.Merge(b);
                Assert.Equal(all.Count[0], a.Count[0]);
                Close(all.Mean[0], a.Mean[0], 1e-12 * Math.Abs(all.Mean[0]) + 1e-300);
                // M2 can be tiny next to the mean's square: compare it against its own scale and the data's
                Close(all.M2[0], a.M2[0], 1e-12 * Math.Max(Math.Abs(all.M2[0]), all.Count[0] * all.Mean[0] * all.Mean[0] * 1e-4));
            });
    }

    [Fact]
    public void Welford_moments_of_a_known_sample_match_the_textbook_values()
    {
        // common practice: the sample 2, 4, 4, 4, 5, 5, 7, 9 has mean 5 and population standard deviation 2
        var s = new MomentState(1, 1);
        foreach (var x in new float[] { 2, 4, 4, 4, 5, 5, 7, 9, float.NaN }) s.Add(0, 0, [x]);
        Assert.Equal(8, s.Count[0]);
        Assert.Equal(5, s.Mean[0], 12);
        Assert.Equal(2, s.StandardDeviation(0), 12);
    }

    [Fact]
    public void Eight_lane_and_scalar_updates_agree_with_missing_values_anywhere()
    {
        var rng = new Random(3);
        var wide = new MomentState(2, 37);
        var narrow = new MomentState(2, 37);
        var frame = new float[37];
        for (int t = 0; t < 50; t++)
        {
            for (int i = 0; i < frame.Length; i++) frame[i] = rng.NextDouble() < 0.1 ? float.NaN : (float)(280 + 10 * rng.NextDouble());
            wide.Add(t % 2, 0, frame);
            for (int i = 0; i < frame.Length; i++) narrow.Add(t % 2, i, frame.AsSpan(i, 1));
        }
        for (int i = 0; i < 74; i++)
        {
            Assert.Equal(narrow.Count[i], wide.Count[i]);
            Close(narrow.Mean[i], wide.Mean[i], 1e-12 * 300);
            Close(narrow.M2[i], wide.M2[i], 1e-9 * Math.Max(1, narrow.M2[i]));
        }
    }

    [Theory]
    // calendar facts (CF Conventions §4.4.1): 360_day has 360 days, noleap 365, all_leap 366
    [InlineData("360_day", 360)]
    [InlineData("noleap", 365)]
    [InlineData("all_leap", 366)]
    [InlineData("standard", 366)]
    [InlineData("proleptic_gregorian", 366)]
    [InlineData("julian", 366)]
    public void Day_of_year_slot_count_follows_the_calendar(string calendar, int slots) =>
        Assert.Equal(slots, SlotScheme.DaysOfYear(CfCalendars.Parse(calendar)!.Value).SlotCount);

    [Fact]
    public void Twenty_ninth_of_February_has_its_own_slot_and_March_keeps_its_slot_in_every_year()
    {
        var scheme = SlotScheme.DaysOfYear(CfCalendar.Standard);
        Assert.Equal(58, scheme.SlotOf(CfTime.Of(CfCalendar.Standard, 2031, 2, 28)));
        Assert.Equal(59, scheme.SlotOf(CfTime.Of(CfCalendar.Standard, 2032, 2, 29)));
        Assert.Equal(60, scheme.SlotOf(CfTime.Of(CfCalendar.Standard, 2031, 3, 1)));
        Assert.Equal(60, scheme.SlotOf(CfTime.Of(CfCalendar.Standard, 2032, 3, 1)));
        Assert.Equal(365, scheme.SlotOf(CfTime.Of(CfCalendar.Standard, 2031, 12, 31)));
        Assert.Equal((2, 29, 0L), scheme.Describe(59));
        var day360 = SlotScheme.DaysOfYear(CfCalendar.Day360);
        Assert.Equal(59, day360.SlotOf(CfTime.Of(CfCalendar.Day360, 2031, 2, 30)));
    }

    [Theory]
    [InlineData("harmonics:3")]
    [InlineData("window:31")]
    public void Smoothing_recovers_a_known_annual_sinusoid_within_the_noise_standard_error(string smoothing)
    {
        // truth(d) = 30 + 5 sin(2π d / 365) on the noleap calendar, plus Gaussian noise σ = 1 on each of 20 years:
        // one slot's raw mean has standard error σ/√20 ≈ 0.22; the smoothed mean must be inside that everywhere.
        const int years = 20;
        const double sigma = 1;
        using var dir = new TempFolder();
        string input = dir.File("daily.nc"), output = dir.File("clim.nc");
        var rng = new Random(11);
        using (var w = ClassicWriter.Create(input))
        {
            var time = w.AddDimension("time", 0, unlimited: true);
            var lat = w.AddDimension("lat", 2);
            var lon = w.AddDimension("lon", 3);
            var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "days since 2001-01-01"), NcAttribute.Text("calendar", "noleap")]);
            var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
            var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
            var v = w.AddVariable("tcwv", NcType.Float, [time, lat, lon], [NcAttribute.Text("units", "kg m-2")]);
            w.EndDefinitions();
            w.Write<float>(vlat, [-10, 10]);
            w.Write<float>(vlon, [0, 120, 240]);
            var frame = new float[6];
            for (int day = 0; day < 365 * years; day++)
            {
                double truth = 30 + 5 * Math.Sin(2 * Math.PI * (day % 365) / 365);
                for (int i = 0; i < 6; i++) frame[i] = (float)(truth + sigma * Normal(rng));
                w.WriteRecord<double>(vt, day, [day + 0.5]);
                w.WriteRecord<float>(v, day, frame);
            }
            w.Commit();
        }
        ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.DayOfYear, output, Smooth: smoothing));
        using var clim = DatasetFiles.Open(output);
        var mean = clim.ReadAllDoubles(clim.RequireVariable("tcwv"));
        double standardError = sigma / Math.Sqrt(years), worst = 0;
        for (int s = 0; s < 365; s++)
            for (int i = 0; i < 6; i++)
                worst = Math.Max(worst, Math.Abs(mean[s * 6 + i] - (30 + 5 * Math.Sin(2 * Math.PI * s / 365))));
        Assert.True(worst < standardError, $"{smoothing}: largest departure from the sinusoid {worst:0.000} ≥ the standard error {standardError:0.000}");
        Assert.True(worst > 1e-4, "the smoothed mean cannot be exactly the truth when noise was added");
    }

    [Fact]
    public void Base_period_ends_name_whole_years_months_or_days()
    {
        var p = TimePeriod.Parse("1991/2020", CfCalendar.Standard);
        Assert.Equal(CfTime.Of(CfCalendar.Standard, 1991, 1, 1), p.Start);
        Assert.Equal(CfTime.Of(CfCalendar.Standard, 2021, 1, 1), p.End);
        Assert.Equal(30, p.Years, 2); // the WMO-No. 1203 standard normal 1991-2020 is 30 years
        var d = TimePeriod.Parse("2031-02/2031-02-30", CfCalendar.Day360);
        Assert.Equal(CfTime.Of(CfCalendar.Day360, 2031, 3, 1), d.End);
        Assert.Throws<FormatException>(() => TimePeriod.Parse("2031-02-30/2032", CfCalendar.NoLeap));
    }

    [Fact]
    public void A_base_shorter_than_thirty_years_warns_naming_the_WMO_practice()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 24, stepHours: 24 * 30);
        var summary = ClimatologyStep.Run(new ClimatologyOptions([input], "tcwv", ClimatologyKind.Month, dir.File("c.nc")));
        Assert.Contains(summary.Warnings, w => w.Contains("WMO-No. 1203") && w.Contains("30 years"));
    }

    static void Close(double expected, double actual, double tolerance) =>
        Assert.True(Math.Abs(expected - actual) <= tolerance, $"expected {expected:R}, got {actual:R}");

    static double Normal(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
