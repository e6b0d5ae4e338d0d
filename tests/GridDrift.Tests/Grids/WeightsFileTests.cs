using System.Text.Json;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Grids;

/// <summary>
/// `regrid --weights`: the weights file is written once and read back on the next run (same
/// output), refused for other grids, and its CSR layout reads with python netCDF4: row_start rises
/// to the entry count, and each 10° target cell's conservative weights sum to its area
/// R² Δλ (sin φ₂ − sin φ₁) (DESIGN.md's cell area, R = 6371008.8 m).
/// </summary>
public class WeightsFileTests
{
    const string Check = """
        import sys, json, numpy as np, netCDF4
        with netCDF4.Dataset(sys.argv[1]) as ds:
            rs = ds["row_start"][:].astype(int); w = ds["weight"][:]; lat = ds["target_lat_edges"][:]; lon = ds["target_lon_edges"][:]
            sums = [float(w[rs[t]:rs[t + 1]].sum()) for t in range(len(rs) - 1)]
            R = 6371008.8
            areas = [R * R * np.deg2rad(lon[i + 1] - lon[i]) * (np.sin(np.deg2rad(lat[j + 1])) - np.sin(np.deg2rad(lat[j]))) for j in range(len(lat) - 1) for i in range(len(lon) - 1)]
            print(json.dumps({"monotonic": bool(np.all(np.diff(rs) >= 0)), "last": int(rs[-1]), "entries": int(ds.dimensions["entry"].size),
                              "max_rel": float(np.max(np.abs(np.array(sums) - np.array(areas)) / np.array(areas)))}))
        """;

    [InteropFact(Needs.PythonNetcdf)]
    public void Weights_are_saved_reused_and_readable_as_CSR()
    {
        using var dir = new TempFolder();
        string input = Global5(dir.File("in.nc"));
        string weights = dir.File("w.nc");
        var first = CliRun.Run("regrid", input, "--var", "tcwv", "--to", "regular:10", "--weights", weights, "--out", dir.File("a.nc"));
        Assert.True(first.ExitCode == 0, first.Stderr);
        var second = CliRun.Run("regrid", input, "--var", "tcwv", "--to", "regular:10", "--weights", weights, "--out", dir.File("b.nc"));
        Assert.Contains("read from", second.Stderr);
        Assert.Equal(File.ReadAllBytes(dir.File("a.nc")).Length, File.ReadAllBytes(dir.File("b.nc")).Length);
        var other = CliRun.Run("regrid", input, "--var", "tcwv", "--to", "regular:20", "--weights", weights, "--out", dir.File("c.nc"));
        Assert.Equal(2, other.ExitCode);
        string script = dir.File("check.py");
        File.WriteAllText(script, Check);
        var r = ExternalTools.Run(ExternalTools.Python, $"\"{script}\" \"{weights}\"");
        Assert.True(r.ExitCode == 0, r.Stderr);
        var json = JsonDocument.Parse(r.Stdout).RootElement;
        Assert.True(json.GetProperty("monotonic").GetBoolean());
        Assert.Equal(json.GetProperty("entries").GetInt32(), json.GetProperty("last").GetInt32());
        Assert.True(json.GetProperty("max_rel").GetDouble() < 1e-12, $"weights against cell areas: {json.GetProperty("max_rel").GetDouble():E2}");
    }

    static string Global5(string path)
    {
        using var w = GridDrift.Formats.Classic.ClassicWriter.Create(path);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", 36);
        var lon = w.AddDimension("lon", 72);
        var vt = w.AddVariable("time", GridDrift.Formats.NcType.Double, [time], [GridDrift.Formats.NcAttribute.Text("units", "days since 2031-01-01")]);
        var vlat = w.AddVariable("lat", GridDrift.Formats.NcType.Double, [lat], [GridDrift.Formats.NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", GridDrift.Formats.NcType.Double, [lon], [GridDrift.Formats.NcAttribute.Text("units", "degrees_east")]);
        var v = w.AddVariable("tcwv", GridDrift.Formats.NcType.Float, [time, lat, lon], [GridDrift.Formats.NcAttribute.Text("units", "kg m-2")]);
        w.EndDefinitions();
        w.Write<double>(vlat, Enumerable.Range(0, 36).Select(j => -87.5 + 5 * j).ToArray());
        w.Write<double>(vlon, Enumerable.Range(0, 72).Select(i => 2.5 + 5 * i).ToArray());
        for (int t = 0; t < 3; t++)
        {
            w.WriteRecord<double>(vt, t, [t]);
            w.WriteRecord<float>(v, t, Enumerable.Range(0, 36 * 72).Select(c => (float)(20 + c % 7 + t)).ToArray());
        }
        w.Commit();
        return path;
    }
}
