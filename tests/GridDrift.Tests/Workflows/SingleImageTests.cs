using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Workflows;

/// <summary>
/// One image per file (a scalar time coordinate, CF §5.7, and no time dimension), as satellite
/// archives deliver them: geostationary images with int16-packed brightness temperature and
/// int16-packed scan angles, written by python netCDF4 under names that do not sort in time order
/// (Interop/scripts/make_single_images.py), give through a glob and through @LIST exactly the
/// products of the same packed values stacked in one file, for describe, stats, similarity,
/// climatology and anomalies. A record of 1,500 one-image files keeps few files open.
/// </summary>
public class SingleImageTests
{
    [InteropFact(Needs.PythonNetcdf)]
    public void One_image_per_file_makes_the_record_the_stacked_file_makes()
    {
        using var dir = new TempFolder();
        ExternalTools.RunPython("make_single_images.py", SharedData.Sample("tb_geostationary_2031.nc"), dir.Path);
        string glob = dir.File("scan_*.nc");
        var images = Directory.GetFiles(dir.Path, "scan_*.nc").Order(StringComparer.Ordinal).ToArray();
        File.WriteAllLines(dir.File("images.txt"), images.Reverse().Select(Path.GetFileName)!);

        var describe = CliRun.Run("describe", glob);
        Assert.True(describe.ExitCode == 0, describe.Stderr);
        Assert.Contains($"record of 'tb' over {images.Length} files (in time order)", describe.Stdout);

        Assert.Equal(0, CliRun.Run("climatology", dir.File("stacked.nc"), "--var", "tb", "--by", "month", "--out", dir.File("clim.nc"), "--quiet").ExitCode);
        var commands = new Dictionary<string, string[]>
        {
            ["stats"] = ["--var", "tb", "--regions", "global", "bands:20"],
            ["similarity"] = ["--var", "tb", "--regions", "global", "--range", "180:320"],
            ["climatology"] = ["--var", "tb", "--by", "month"],
            ["anomalies"] = ["--var", "tb", "--climatology", dir.File("clim.nc"), "--regions", "global"],
        };
        foreach (var (command, options) in commands)
        {
            foreach (var (name, input) in new[] { ("stacked", dir.File("stacked.nc")), ("glob", glob), ("list", "@" + dir.File("images.txt")) })
            {
                var outcome = CliRun.Run([command, input, .. options, "--out", dir.File($"{command}_{name}.nc"), "--quiet"]);
                Assert.True(outcome.ExitCode == 0, $"{command} {name}: {outcome.Stderr}");
            }
            ProductComparison.AssertSameValues(dir.File($"{command}_stacked.nc"), dir.File($"{command}_glob.nc"));
            ProductComparison.AssertSameValues(dir.File($"{command}_stacked.nc"), dir.File($"{command}_list.nc"));
        }
    }

    [Fact]
    public void A_record_of_many_one_image_files_keeps_few_files_open()
    {
        using var dir = new TempFolder();
        const int files = 1500;
        var random = new Random(8);
        for (int k = 0; k < files; k++)
        {
            using var w = ClassicWriter.Create(dir.File($"img_{random.Next():D10}_{k}.nc"), ClassicVariant.Cdf2);
            var lat = w.AddDimension("lat", 4);
            var lon = w.AddDimension("lon", 8);
            var t = w.AddVariable("t", NcType.Double, [], [NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("standard_name", "time")]);
            var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
            var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
            var tb = w.AddVariable("tb", NcType.Float, [lat, lon], [NcAttribute.Text("units", "K"), NcAttribute.Text("coordinates", "t")]);
            w.EndDefinitions();
            w.Write<double>(t, [k]);
            w.Write<float>(vlat, [-60f, -20f, 20f, 60f]);
            w.Write<float>(vlon, Enumerable.Range(0, 8).Select(i => 45f * i).ToArray());
            w.Write<float>(tb, Enumerable.Range(0, 32).Select(i => 250f + k).ToArray());
            w.Commit();
        }
        int before = Directory.GetFiles("/proc/self/fd").Length;
        var clock = System.Diagnostics.Stopwatch.StartNew();
        using (var source = FrameSource.Open(InputPaths.Expand([dir.File("img_*.nc")]), "tb"))
        {
            Assert.Equal(files, source.FrameCount);
            Assert.True(source.Times.Zip(source.Times.Skip(1)).All(p => p.First < p.Second), "frames in time order");
            var frame = new float[source.FrameLength];
            for (int k = 0; k < files; k += 7)
            {
                source.ReadFrame(k, frame);
                Assert.Equal(250f + k, frame[0]); // frame k holds 250 + its hour, whatever the file's name
            }
            Assert.True(Directory.GetFiles("/proc/self/fd").Length - before < 100, "the record keeps at most the pool's files open");
        }
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(30), $"opening, sorting and reading {files} files took {clock.Elapsed}");
    }
}
