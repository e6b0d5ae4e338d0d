using System.Diagnostics;
using System.Globalization;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;

namespace GridDrift.Benchmarks;

/// <summary>
/// Frame-by-frame reads of a 400 × 361 × 720 float32 record, as CDF-2 (written by GridDrift) and
/// as deflate netCDF-4 (written by python netCDF4), GridDrift against python netCDF4 on the same
/// files in the same run, each reader in its own process so peak memory is its own. Run at two
/// record lengths to show that peak memory does not grow with the number of frames.
/// </summary>
internal static class ReadBenchmark
{
    const int Lat = 361, Lon = 720;

    public static int Run(string[] args)
    {
        int frames = Option(args, "--frames", 400);
        string dir = OptionText(args, "--dir", Path.Combine(Path.GetTempPath(), "griddrift-bench"));
        Directory.CreateDirectory(dir);
        string self = Environment.ProcessPath!;
        string selfArgs = self.EndsWith("dotnet") ? $"\"{typeof(ReadBenchmark).Assembly.Location}\" " : "";
        string python = "/usr/bin/python3";
        string peers = Path.Combine(AppContext.BaseDirectory, "peers");

        string cdf2 = Path.Combine(dir, $"bench_{frames}.nc");
        string nc4 = Path.Combine(dir, $"bench_{frames}_deflate.nc");
        if (!File.Exists(cdf2)) WriteClassic(cdf2, frames);
        if (!File.Exists(nc4)) Measure.Run(python, $"\"{Path.Combine(peers, "netcdf4_write_deflate.py")}\" \"{nc4}\" {frames} {Lat} {Lon}");

        Console.WriteLine($"read benchmark: {frames} frames of {Lat} × {Lon} float32 ({frames * (long)Lat * Lon * 4 / 1e6:0} MB of field data), {Environment.ProcessorCount} cores");
        foreach (var (label, path) in new[] { ("CDF-2", cdf2), ("netCDF-4 deflate", nc4) })
        {
            Measure.Warm(path);
            var ours = Best(3, () => Measure.Run(self, $"{selfArgs}read-one \"{path}\" tb {frames}"));
            var peer = Best(3, () => Measure.Run(python, $"\"{Path.Combine(peers, "netcdf4_read.py")}\" \"{path}\" tb {frames}"));
            Console.WriteLine($"  {label,-17} GridDrift {ours.Seconds,7:0.000} s ({frames / ours.Seconds,6:0} frames/s, peak {ours.PeakMiB,6:0} MiB)" +
                              $" | python netCDF4 {peer.Seconds,7:0.000} s (peak {peer.PeakMiB,6:0} MiB) | ratio {peer.Seconds / ours.Seconds:0.00}×" +
                              $" | sums agree: {Math.Abs(ours.Sum - peer.Sum) <= 1e-9 * Math.Abs(peer.Sum)}");
        }
        return 0;
    }

    sealed record Timing(double Seconds, double PeakMiB, double Sum);

    static Timing Best(int repeats, Func<string> run)
    {
        Timing? best = null;
        for (int i = 0; i < repeats; i++)
        {
            var parts = run().Split(' ');
            var t = new Timing(double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture),
                double.Parse(parts[2], CultureInfo.InvariantCulture));
            if (best is null || t.Seconds < best.Seconds) best = t;
        }
        return best!;
    }

    /// <summary>The measured reader: every frame decoded into one reused buffer and summed in float64.</summary>
    public static int ReadOne(string[] args)
    {
        string path = args[0], name = args[1];
        int frames = int.Parse(args[2], CultureInfo.InvariantCulture);
        using var source = FrameSource.Open([path], name);
        var frame = new float[source.FrameLength];
        var clock = Stopwatch.StartNew();
        double total = 0;
        for (int i = 0; i < frames; i++)
        {
            source.ReadFrame(i, frame);
            double s = 0;
            foreach (var v in frame) if (!float.IsNaN(v)) s += v;
            total += s;
        }
        clock.Stop();
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{clock.Elapsed.TotalSeconds:0.0000} {Measure.PeakResidentMiB():0.0} {total:0.000000e+00}"));
        return 0;
    }

    static void WriteClassic(string path, int frames)
    {
        var rng = new Random(1);
        using var w = ClassicWriter.Create(path, ClassicVariant.Cdf2);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", Lat);
        var lon = w.AddDimension("lon", Lon);
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "hours since 2031-01-01")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var vtb = w.AddVariable("tb", NcType.Float, [time, lat, lon], [NcAttribute.Text("units", "K"), NcAttribute.Of("_FillValue", -999f)]);
        w.EndDefinitions();
        w.Write<float>(vlat, Enumerable.Range(0, Lat).Select(i => -90f + 0.5f * i).ToArray());
        w.Write<float>(vlon, Enumerable.Range(0, Lon).Select(i => 0.5f * i).ToArray());
        var frame = new float[Lat * Lon];
        for (int t = 0; t < frames; t++)
        {
            for (int y = 0; y < Lat; y++)
            {
                double phi = (-90 + 0.5 * y) * Math.PI / 180;
                for (int x = 0; x < Lon; x++)
                    frame[y * Lon + x] = (float)(240 + 20 * Math.Cos(phi) + 5 * Math.Sin(3 * x * Math.PI / 360 - t / 10.0) + (rng.NextDouble() - 0.5));
            }
            w.WriteRecord<double>(vt, t, [t]);
            w.WriteRecord<float>(vtb, t, frame);
        }
        w.Commit();
    }

    static int Option(string[] args, string name, int fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? int.Parse(args[i + 1], CultureInfo.InvariantCulture) : fallback;
    }

    static string OptionText(string[] args, string name, string fallback)
    {
        int i = Array.IndexOf(args, name);
        return i >= 0 && i + 1 < args.Length ? args[i + 1] : fallback;
    }
}
