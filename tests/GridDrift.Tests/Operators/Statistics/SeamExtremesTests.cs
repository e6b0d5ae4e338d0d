using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Statistics;

/// <summary>
/// R1: minimum and maximum over a box that crosses the grid's longitude seam (the date line on a
/// −180..180 grid, Greenwich on a 0..360 grid) are those of the cells in the box, not of the
/// whole latitude rows; witness: numpy on the same cells (Interop/scripts/seam_extremes.py), on
/// both longitude conventions, for a box across each seam.
/// </summary>
public class SeamExtremesTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void Extremes_over_a_box_across_the_seam_are_those_of_its_cells()
    {
        using var dir = new TempFolder();
        string[] boxes = ["dl=1,9,171,-171", "gw=1,9,-9,9", "wide=-30,30,150,-150"];
        var expected = JsonDocument.Parse(ExternalTools.RunPython("seam_extremes.py", [dir.Path, .. boxes])).RootElement;
        foreach (var file in new[] { "east", "west" })
        {
            var outcome = CliRun.Run(["stats", dir.File(file + ".nc"), "--var", "x", "--stat", "min,max", "--out", dir.File(file + "_s.nc"), "--quiet",
                "--regions", .. boxes.Select(b => "box:" + b)]);
            Assert.True(outcome.ExitCode == 0, outcome.Stderr);
            using var reader = DatasetFiles.Open(dir.File(file + "_s.nc"));
            var min = reader.ReadAllDoubles(reader.RequireVariable("min"));
            var max = reader.ReadAllDoubles(reader.RequireVariable("max"));
            for (int b = 0; b < boxes.Length; b++)
            {
                var want = expected.GetProperty(file).GetProperty(boxes[b].Split('=')[0]).EnumerateArray().Select(e => e.EnumerateArray().Select(x => x.GetDouble()).ToArray()).ToArray();
                for (int k = 0; k < want.Length; k++)
                {
                    Assert.True(Math.Abs(want[k][0] - min[k * boxes.Length + b]) < 1e-5, $"{file} {boxes[b]} frame {k}: min numpy {want[k][0]}, GridDrift {min[k * boxes.Length + b]}");
                    Assert.True(Math.Abs(want[k][1] - max[k * boxes.Length + b]) < 1e-5, $"{file} {boxes[b]} frame {k}: max numpy {want[k][1]}, GridDrift {max[k * boxes.Length + b]}");
                }
            }
        }
    }
}
