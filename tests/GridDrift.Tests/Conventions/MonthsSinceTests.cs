using System.Text.Json;
using GridDrift.Frames;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Conventions;

/// <summary>
/// R3: whole "months since" and "years since" values in a real-world calendar are calendar months
/// and years (common practice for monthly data; UDUNITS' fixed 30.436875-day month put 24
/// monthly frames into month slots 3,0,2,…), with a one-line warning; a value that is not whole
/// is refused saying why; 360_day keeps its 30-day months. Witness: cftime's dates
/// (Interop/scripts/months_since.py).
/// </summary>
public class MonthsSinceTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Whole_months_and_years_are_calendar_months_and_years_as_cftime_dates_them()
    {
        using var dir = new TempFolder();
        var expected = JsonDocument.Parse(ExternalTools.RunPython("months_since.py", dir.Path)).RootElement;
        foreach (var name in new[] { "standard", "years", "d360" })
        {
            using var source = FrameSource.Open([dir.File(name + ".nc")], "x");
            Assert.Equal(expected.GetProperty(name).EnumerateArray().Select(e => e.GetString()), source.Times.Select(t => t.ToIsoString()));
            if (name == "d360") Assert.Empty(source.Warnings);
            else Assert.Contains(source.Warnings, w => w.Contains("read as calendar", StringComparison.Ordinal));
        }

        // the symptom: a monthly climatology of 24 monthly frames has two samples in every month
        var stats = CliRun.Run("climatology", dir.File("standard.nc"), "--var", "x", "--by", "month", "--out", dir.File("clim.nc"));
        Assert.True(stats.ExitCode == 0, stats.Stderr);
        Assert.Single(stats.StderrLines, l => l.Contains("warning", StringComparison.Ordinal) && l.Contains("calendar months", StringComparison.Ordinal));
        using var clim = GridDrift.Formats.DatasetFiles.Open(dir.File("clim.nc"));
        var counts = GridDrift.Formats.DatasetReaderExtensions.ReadAllDoubles(clim, GridDrift.Formats.DatasetReaderExtensions.RequireVariable(clim, "x_count"));
        Assert.All(counts, c => Assert.Equal(2, c));
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void A_fraction_of_a_month_is_refused_saying_why()
    {
        using var dir = new TempFolder();
        ExternalTools.RunPython("months_since.py", dir.Path);
        var outcome = CliRun.Run("stats", dir.File("fraction.nc"), "--var", "x", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("is not a whole number of months", Assert.Single(outcome.StderrLines));
    }
}
