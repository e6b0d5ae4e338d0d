using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// `similarity --reference OBS --candidate MODEL`: the two datasets are paired at the times both
/// hold; a candidate equal to the reference plus 2 has, by the definitions, a bias of 2, an RMS
/// difference of 2 and a correlation of 1 in every region.
/// </summary>
public class ComparisonTests
{
    [Fact]
    public void A_constant_offset_gives_its_bias_and_RMS_difference_at_the_shared_times()
    {
        using var dir = new TempFolder();
        var (obs, candidate) = Records(dir);
        var outcome = CliRun.Run("similarity", "--reference", obs, "--candidate", candidate, "--var", "tcwv", "--regions", "global", "bands:60",
            "--metric", "bias,rmsd,corr", "--range", "0:300", "--out", dir.File("cmp.nc"), "--quiet");
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        using var r = DatasetFiles.Open(dir.File("cmp.nc"));
        var bias = r.ReadAllDoubles(r.RequireVariable("bias"));
        var rmsd = r.ReadAllDoubles(r.RequireVariable("rmsd"));
        var corr = r.ReadAllDoubles(r.RequireVariable("corr"));
        Assert.Equal(6 * 4, bias.Length); // 6 shared times × (global + 3 bands)
        Assert.All(bias, v => Assert.True(Math.Abs(v - 2) < 1e-5, $"bias {v}"));
        Assert.All(rmsd, v => Assert.True(Math.Abs(v - 2) < 1e-5, $"rmsd {v}"));
        Assert.All(corr, v => Assert.True(Math.Abs(v - 1) < 1e-9, $"corr {v}"));
        Assert.False(r.Variables.Any(v => v.Name == "time_bnds"), "a comparison has no pair bounds");
    }

    [Fact]
    public void The_library_comparison_gives_the_same_offset_in_memory()
    {
        using var dir = new TempFolder();
        var (obs, candidate) = Records(dir);
        using var reference = GridDrift.GridRecord.Open([obs], "tcwv");
        using var model = GridDrift.GridRecord.Open([candidate], "tcwv");
        var series = model.Comparison(reference, model.Regions("global"), range: "0:300");
        Assert.Equal(6, series.Times.Count);
        Assert.All(series.Of("global", "bias"), v => Assert.True(Math.Abs(v - 2) < 1e-5, $"bias {v}"));
        Assert.All(series.Of("global", "rmsd"), v => Assert.True(Math.Abs(v - 2) < 1e-5, $"rmsd {v}"));
        Assert.All(series.Of("global", "corr"), v => Assert.True(Math.Abs(v - 1) < 1e-9, $"corr {v}"));
    }

    /// <summary>A reference of 8 daily frames and a candidate: the same fields plus 2, at the reference's times 2 … 7 only.</summary>
    static (string Reference, string Candidate) Records(TempFolder dir)
    {
        string obs = SampleFiles.Record(dir.File("obs.nc"), frames: 8, stepHours: 24, nlat: 6, nlon: 12);
        string candidate = SampleFiles.Record(dir.File("cand.nc"), hours: Enumerable.Range(2, 6).Select(i => 24.0 * i), nlat: 6, nlon: 12);
        AddOffset(candidate, 2f);
        return (obs, candidate);
    }

    /// <summary>Rewrites a sample record with every tcwv value raised by <paramref name="offset"/>.</summary>
    static void AddOffset(string path, float offset)
    {
        using var reader = DatasetFiles.Open(path);
        var lat = reader.ReadAllDoubles(reader.RequireVariable("lat")).Select(v => (float)v).ToArray();
        var lon = reader.ReadAllDoubles(reader.RequireVariable("lon")).Select(v => (float)v).ToArray();
        var time = reader.ReadAllDoubles(reader.RequireVariable("time"));
        var values = reader.ReadAllDoubles(reader.RequireVariable("tcwv"));
        reader.Dispose();
        using var w = GridDrift.Formats.Classic.ClassicWriter.Create(path);
        var t = w.AddDimension("time", 0, unlimited: true);
        var y = w.AddDimension("lat", lat.Length);
        var x = w.AddDimension("lon", lon.Length);
        var vt = w.AddVariable("time", NcType.Double, [t], [NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("calendar", "standard")]);
        var vy = w.AddVariable("lat", NcType.Float, [y], [NcAttribute.Text("units", "degrees_north")]);
        var vx = w.AddVariable("lon", NcType.Float, [x], [NcAttribute.Text("units", "degrees_east")]);
        var v = w.AddVariable("tcwv", NcType.Float, [t, y, x], [NcAttribute.Text("units", "kg m-2")]);
        w.EndDefinitions();
        w.Write<float>(vy, lat);
        w.Write<float>(vx, lon);
        int cells = lat.Length * lon.Length;
        for (int k = 0; k < time.Length; k++)
        {
            w.WriteRecord<double>(vt, k, [time[k]]);
            w.WriteRecord<float>(v, k, values.Skip(k * cells).Take(cells).Select(d => (float)d + offset).ToArray());
        }
        w.Commit();
    }
}
