using GridDrift.Frames;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Frames;

/// <summary>
/// Several files that split one record along time open as one ordered sequence of frames. The
/// expected times and values are the invented inputs the files were written with.
/// </summary>
public class MultiFileRecordTests
{
    [Fact]
    public void Files_given_in_any_order_open_sorted_by_time_with_gaps_listed()
    {
        using var dir = new TempFolder();
        var c = SampleFiles.Record(dir.File("c.nc"), hours: [24, 27]);
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3, 6]);
        var b = SampleFiles.Record(dir.File("b.nc"), hours: [9, 12, 18]);
        using var source = FrameSource.Open([c, a, b], "tcwv");
        Assert.Equal([a, b, c], source.Files);
        Assert.Equal(["2031-01-01T00:00:00", "2031-01-01T03:00:00", "2031-01-01T06:00:00", "2031-01-01T09:00:00",
            "2031-01-01T12:00:00", "2031-01-01T18:00:00", "2031-01-02T00:00:00", "2031-01-02T03:00:00"], source.Times.Select(t => t.ToIsoString()));
        Assert.Equal("PT3H", source.Step!.Value.ToIso8601());
        Assert.Equal(2, source.Gaps.Count);
        Assert.Equal("2031-01-01T12:00:00", source.Gaps[0].Before.ToIsoString());
        Assert.Equal(1, source.Gaps[0].MissingSteps, 9);
        Assert.Equal(1, source.Gaps[1].MissingSteps, 9);

        var frame = new float[12];
        source.ReadFrame(5, frame); // hour 18 in b.nc: value = hour + 0.25 × cell index
        Assert.Equal(Enumerable.Range(0, 12).Select(i => (float)(18 + i * 0.25)), frame);
        Assert.Equal((b, 2), source.Locate(5));
    }

    [Fact]
    public void A_glob_expands_to_the_matching_files_in_name_order()
    {
        using var dir = new TempFolder();
        SampleFiles.Record(dir.File("era_2031_02.nc"), hours: [744, 747]);
        SampleFiles.Record(dir.File("era_2031_01.nc"), hours: [0, 3]);
        File.WriteAllText(dir.File("notes.txt"), "not a match");
        var paths = InputPaths.Expand([Path.Combine(dir.Path, "era_2031_*.nc")]);
        Assert.Equal([dir.File("era_2031_01.nc"), dir.File("era_2031_02.nc")], paths);
        Assert.Throws<BadInputException>(() => InputPaths.Expand([Path.Combine(dir.Path, "none_*.nc")]));
    }

    [Fact]
    public void A_missing_variable_is_refused_naming_both_files()
    {
        using var dir = new TempFolder();
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3]);
        var b = SampleFiles.Record(dir.File("b.nc"), hours: [6, 9], variable: "q");
        var e = Assert.Throws<BadInputException>(() => FrameSource.Open([a, b], "tcwv"));
        Assert.Contains(a, e.Message);
        Assert.Contains(b, e.Message);
        Assert.Contains("'tcwv'", e.Message);
    }

    [Fact]
    public void A_different_grid_is_refused_naming_both_files()
    {
        using var dir = new TempFolder();
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3]);
        var shifted = SampleFiles.Record(dir.File("b.nc"), hours: [6, 9], latOffset: 0.5f);
        var e = Assert.Throws<BadInputException>(() => FrameSource.Open([a, shifted], "tcwv"));
        Assert.Contains(a, e.Message);
        Assert.Contains(shifted, e.Message);
        Assert.Contains("grid differs", e.Message);

        var bigger = SampleFiles.Record(dir.File("c.nc"), hours: [6, 9], nlat: 5);
        e = Assert.Throws<BadInputException>(() => FrameSource.Open([a, bigger], "tcwv"));
        Assert.Contains("lat", e.Message);
    }

    [Fact]
    public void Overlapping_or_duplicated_times_are_refused()
    {
        using var dir = new TempFolder();
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3, 6]);
        var b = SampleFiles.Record(dir.File("b.nc"), hours: [6, 9]);
        var e = Assert.Throws<BadInputException>(() => FrameSource.Open([a, b], "tcwv"));
        Assert.Contains("overlap", e.Message);
        Assert.Contains(a, e.Message);

        var twice = SampleFiles.Record(dir.File("twice.nc"), hours: [0, 3, 3, 6]);
        e = Assert.Throws<BadInputException>(() => FrameSource.Open([twice], "tcwv"));
        Assert.Contains("occurs twice", e.Message);
    }

    [Fact]
    public void Files_in_different_calendars_are_refused()
    {
        using var dir = new TempFolder();
        var a = SampleFiles.Record(dir.File("a.nc"), hours: [0, 3]);
        var b = SampleFiles.Record(dir.File("b.nc"), hours: [6, 9], calendar: "noleap");
        var e = Assert.Throws<BadInputException>(() => FrameSource.Open([a, b], "tcwv"));
        Assert.Contains("calendar", e.Message);
    }

    [Fact]
    public void Monthly_records_have_a_calendar_month_step_and_their_gaps_are_whole_months()
    {
        // Monthly means stamped on the 15th: intervals of 28 to 31 days are all one month.
        using var dir = new TempFolder();
        double[] days = [14, 45, 73, 104, 165]; // 15 Jan, 15 Feb, 15 Mar, 15 Apr (2031, standard), then 15 Jun
        var path = SampleFiles.Record(dir.File("monthly.nc"), hours: days.Select(d => d * 24));
        using var source = FrameSource.Open([path], "tcwv");
        Assert.Equal("P1M", source.Step!.Value.ToIso8601());
        var gap = Assert.Single(source.Gaps);
        Assert.Equal("2031-04-15T00:00:00", gap.Before.ToIsoString());
        Assert.Equal(1, gap.MissingSteps, 9);
    }
}
