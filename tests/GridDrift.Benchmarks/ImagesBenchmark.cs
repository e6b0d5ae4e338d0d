using System.Diagnostics;
using System.Globalization;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Operators.Statistics;
using GridDrift.Workflows;

namespace GridDrift.Benchmarks;

/// <summary>
/// One image per file against the same frames stacked in one file, in the same run: N files of
/// one 500 × 500 int16-packed image each (a scalar time coordinate, names not in time order),
/// and one file holding the N frames along time; `stats` (global + bands:20) over both. Reports
/// the time to open and sort the N headers, frames per second each way, and their ratio.
/// </summary>
internal static class ImagesBenchmark
{
    const int Rows = 500, Columns = 500;

    public static int Run(string[] args)
    {
        int files = args.Length > 0 && !args[0].StartsWith('-') ? int.Parse(args[0], CultureInfo.InvariantCulture) : 20_000;
        string root = args.SkipWhile(a => a != "--dir").Skip(1).FirstOrDefault() ?? Path.Combine(Path.GetTempPath(), "griddrift-images-bench");
        Directory.CreateDirectory(root);
        string images = Path.Combine(root, "images"), stacked = Path.Combine(root, "stacked.nc");
        Directory.CreateDirectory(images);
        var write = Stopwatch.StartNew();
        Write(images, stacked, files);
        Console.WriteLine($"images benchmark: {files} files of one {Rows} × {Columns} int16 image, and the same frames stacked in one file (written in {write.Elapsed.TotalSeconds:0} s), {Environment.ProcessorCount} cores");

        var paths = InputPaths.Expand([Path.Combine(images, "scan_*.nc")]);
        var open = Stopwatch.StartNew();
        using (var source = FrameSource.Open(paths, "tb")) if (source.FrameCount != files) throw new InvalidOperationException("frames lost");
        open.Stop();
        Console.WriteLine($"  open and sort {files} headers: {open.Elapsed.TotalSeconds:0.00} s ({open.Elapsed.TotalMilliseconds * 1000 / files:0} µs per file)");

        double Stats(IReadOnlyList<string> inputs, string label)
        {
            foreach (var p in inputs) Measure.Warm(p);
            string output = Path.Combine(root, $"stats_{label}.nc");
            var clock = Stopwatch.StartNew();
            StatsStep.Run(new StatsOptions(inputs, "tb", ["global", "bands:20"], [RegionStatistic.Mean, RegionStatistic.Std, RegionStatistic.Valid], output));
            double rate = files / clock.Elapsed.TotalSeconds;
            Console.WriteLine($"  stats, {label,-8}: {clock.Elapsed.TotalSeconds,7:0.00} s, {rate,8:0} frames/s");
            return rate;
        }
        // each run starts with its own data in the page cache and the other's out of it: both sets together
        // (2 × FILES × 0.5 MB) can exceed the machine's memory, and the later run would then read from disk
        Evict(paths);
        double one = Stats([stacked], "stacked");
        Evict([stacked]);
        double many = Stats(paths, "images");
        Console.WriteLine($"  images / stacked: {many / one:0.00}× (goal ≥ 0.7×)");
        return 0;
    }

    /// <summary>Drops files' pages from the page cache (posix_fadvise DONTNEED), so they do not crowd out the data of the run measured next.</summary>
    static void Evict(IEnumerable<string> paths)
    {
        foreach (var path in paths)
        {
            using var handle = File.OpenHandle(path);
            _ = posix_fadvise((int)handle.DangerousGetHandle(), 0, 0, 4);
        }
    }

    [System.Runtime.InteropServices.DllImport("libc")]
    static extern int posix_fadvise(int fd, long offset, long length, int advice);

    static void Write(string folder, string stacked, int files)
    {
        if (File.Exists(stacked) && Directory.GetFiles(folder, "scan_*.nc").Length == files) return;
        foreach (var f in Directory.GetFiles(folder)) File.Delete(f);
        var rng = new Random(2);
        var lat = Enumerable.Range(0, Rows).Select(i => (float)(-60 + 120.0 * i / (Rows - 1))).ToArray();
        var lon = Enumerable.Range(0, Columns).Select(i => (float)(-60 + 120.0 * i / (Columns - 1))).ToArray();
        var image = new short[Rows * Columns];
        using var all = ClassicWriter.Create(stacked, ClassicVariant.Cdf2);
        var time = all.AddDimension("time", 0, unlimited: true);
        var (vt, vlat, vlon, vtb) = Define(all, time);
        all.EndDefinitions();
        all.Write<float>(vlat, lat);
        all.Write<float>(vlon, lon);
        var order = Enumerable.Range(0, files).OrderBy(_ => rng.Next()).ToArray();
        for (int k = 0; k < files; k++)
        {
            for (int i = 0; i < image.Length; i++) image[i] = (short)(rng.Next(-20000, 20000));
            all.WriteRecord<double>(vt, k, [k]);
            all.WriteRecord<short>(vtb, k, image);
            using var one = ClassicWriter.Create(Path.Combine(folder, $"scan_{order[k]:D6}.nc"), ClassicVariant.Cdf2);
            var (t, la, lo, tb) = Define(one, null);
            one.EndDefinitions();
            one.Write<double>(t, [k]);
            one.Write<float>(la, lat);
            one.Write<float>(lo, lon);
            one.Write<short>(tb, image);
            one.Commit();
        }
        all.Commit();
    }

    static (ClassicWriter.Definition T, ClassicWriter.Definition Lat, ClassicWriter.Definition Lon, ClassicWriter.Definition Tb) Define(ClassicWriter w, NcDimension? time)
    {
        var lat = w.AddDimension("lat", Rows);
        var lon = w.AddDimension("lon", Columns);
        var t = w.AddVariable("time", NcType.Double, time is null ? [] : [time], [NcAttribute.Text("units", "hours since 2031-01-01 00:00:00"), NcAttribute.Text("standard_name", "time")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        List<NcAttribute> attributes = [NcAttribute.Text("units", "K"), NcAttribute.Of("scale_factor", 0.002f), NcAttribute.Of("add_offset", 250f), NcAttribute.Of("_FillValue", (short)-32768)];
        if (time is null) attributes.Add(NcAttribute.Text("coordinates", "time")); // the scalar time coordinate of one image
        var tb = w.AddVariable("tb", NcType.Short, time is null ? [lat, lon] : [time, lat, lon], attributes);
        return (t, vlat, vlon, tb);
    }
}
