using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Conventions;

/// <summary>
/// `regrid --resample PT3H` (onto the record's own grid, so only time changes): hourly values
/// v(t) = t + 0.25·cell become 3-hour means over [0, 3), [3, 6) … h, stamped mid-period with those
/// bounds — by the definition of a mean, (t + (t+1) + (t+2))/3 + 0.25·cell.
/// </summary>
public class ResampleTests
{
    [Fact]
    public void Hourly_frames_become_three_hour_means_with_their_bounds()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("hourly.nc"), frames: 12, stepHours: 1, nlat: 3, nlon: 4);
        var outcome = CliRun.Run("regrid", input, "--var", "tcwv", "--to", input, "--resample", "PT3H", "--out", dir.File("3h.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        using var r = DatasetFiles.Open(dir.File("3h.nc"));
        var time = r.ReadAllDoubles(r.RequireVariable("time"));
        var bounds = r.ReadAllDoubles(r.RequireVariable("time_bnds"));
        var values = r.ReadAllDoubles(r.RequireVariable("tcwv"));
        Assert.Equal([1.5, 4.5, 7.5, 10.5], time);
        Assert.Equal([0.0, 3, 3, 6, 6, 9, 9, 12], bounds);
        for (int k = 0; k < 4; k++)
            for (int c = 0; c < 12; c++)
                Assert.True(Math.Abs(values[k * 12 + c] - (3 * k + 1 + 0.25 * c)) < 1e-4, $"period {k}, cell {c}: {values[k * 12 + c]}");
        Assert.Equal("area: mean time: mean", r.RequireVariable("tcwv").Attributes.Text("cell_methods"));
    }
}
