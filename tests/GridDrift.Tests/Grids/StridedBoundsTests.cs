using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Grids;

/// <summary>
/// R6: cells need not touch. A stride-2 latitude subset keeping each cell's own CF bounds gets
/// each cell's area from its own bounds: the global region's area and the area-weighted mean equal
/// numpy's exact areas of those cells (Interop/scripts/strided_bounds.py). Read as one edge list,
/// the area was 5.06e14 m² instead of 2.55e14.
/// </summary>
public class StridedBoundsTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Cells_with_their_own_bounds_have_their_own_areas()
    {
        using var dir = new TempFolder();
        var expected = JsonDocument.Parse(ExternalTools.RunPython("strided_bounds.py", dir.Path)).RootElement;
        var outcome = CliRun.Run("stats", dir.File("strided.nc"), "--var", "tcwv", "--regions", "global", "--stat", "mean", "--out", dir.File("s.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        using var reader = DatasetFiles.Open(dir.File("s.nc"));
        double area = reader.ReadAllDoubles(reader.RequireVariable("region_area"))[0];
        double want = expected.GetProperty("area").GetDouble();
        Assert.True(Math.Abs(area - want) < 1e-9 * want, $"global area {area:E6} m², numpy {want:E6}");
        var mean = reader.ReadAllDoubles(reader.RequireVariable("mean"));
        var wantMean = expected.GetProperty("mean").EnumerateArray().Select(e => e.GetDouble()).ToArray();
        for (int k = 0; k < 2; k++) Assert.True(Math.Abs(mean[k] - wantMean[k]) < 1e-5, $"frame {k}: mean {mean[k]}, numpy {wantMean[k]}");
    }
}
