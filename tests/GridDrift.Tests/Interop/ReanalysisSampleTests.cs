using GridDrift.Conventions.Values;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// The real ERA-Interim sample of ../shared/data/reanalysis: packed int16 with scale_factor and
/// add_offset, and a _FillValue of NaN that an int16 cannot hold (python netCDF4 ignores it with
/// a warning, and so must GridDrift). Witness: python netCDF4's decoded values.
/// </summary>
public class ReanalysisSampleTests
{
    [InteropFact(Needs.PythonNetcdf | Needs.SharedData)]
    public void Eraint_unpacks_to_the_values_python_netCDF4_gives()
    {
        string path = SharedData.Reanalysis("eraint_uvz.nc");
        var reference = ReferenceDump.Of(path, decoded: true, maxElements: 1_000_000);
        using var reader = DatasetFiles.Open(path);
        foreach (var name in new[] { "z", "u", "v" })
        {
            var v = reader.RequireVariable(name);
            var codec = ValueCodec.For(v);
            Assert.Contains(codec.Warnings, w => w.Contains("_FillValue") && w.Contains("ignored"));
            var raw = reader.ReadAllDoubles(v);
            var ours = new float[raw.Length];
            codec.Decode(raw, ours);
            var expected = ReferenceDump.Numbers(reference.Variable(name).GetProperty("values"));
            Assert.Equal(expected.Length, ours.Length);
            for (int i = 0; i < expected.Length; i++)
                Assert.Equal((float)expected[i], ours[i]); // python unpacks in float64 then we both hold float32 of it
        }
    }

    [InteropFact(Needs.PythonNetcdf | Needs.SharedData)]
    public void Basin_mask_reads_like_python_netCDF4()
    {
        string path = SharedData.Reanalysis("basin_mask.nc");
        var reference = ReferenceDump.Of(path, decoded: false, maxElements: 3_000_000);
        using var reader = DatasetFiles.Open(path);
        foreach (var (name, expected) in reference.Variables.Select(p => (p.Name, p.Value)))
            if (expected.TryGetProperty("values", out var values))
                Assert.Equal(ReferenceDump.Numbers(values), reader.ReadAllDoubles(reader.RequireVariable(name)));
        Assert.Contains("\n", reader.Attributes.Text("CLIST") ?? reader.Variables.SelectMany(v => v.Attributes).First(a => a.Name == "CLIST").AsText());
    }
}
