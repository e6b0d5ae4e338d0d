using System.Diagnostics;
using System.Globalization;
using GridDrift.Frames;

namespace GridDrift.Benchmarks;

/// <summary>
/// Reading a reanalysis as it is delivered and as it is stored: FRAMES frames of 721 × 1440 from a
/// GRIB 2 file written by ecCodes (16-bit simple packing; opened for the first time, and again
/// with its index remembered) and from Zarr v2 stores written by
/// python3-zarr (zarr's default blosc-lz4 in one-frame chunks; zstd in chunks of eight frames),
/// each frame decoded and summed, GridDrift through its frame engine (every core) against
/// python3-eccodes and python3-zarr, each in its own process, turn about, the fastest of five.
/// </summary>
internal static class FormatsBenchmark
{
    const int Rows = 721, Columns = 1440;

    public static int Run(string[] args)
    {
        int frames = args.Length > 0 && !args[0].StartsWith('-') ? int.Parse(args[0], CultureInfo.InvariantCulture) : 200;
        string dir = args.SkipWhile(a => a != "--dir").Skip(1).FirstOrDefault() ?? Path.Combine(Path.GetTempPath(), "griddrift-formats");
        Directory.CreateDirectory(dir);
        string python = "/usr/bin/python3", peers = Path.Combine(AppContext.BaseDirectory, "peers");
        string self = Environment.ProcessPath!;
        string selfArgs = self.EndsWith("dotnet") ? $"\"{typeof(FormatsBenchmark).Assembly.Location}\" " : "";

        string grib = Path.Combine(dir, $"tcwv_{frames}.grib2");
        if (!File.Exists(grib)) Measure.Run(python, $"\"{Path.Combine(peers, "grib_write.py")}\" \"{grib}\" {frames} {Rows} {Columns}");
        var stores = new[] { ("blosc", 1), ("zstd", 8) }.Select(c =>
        {
            string path = Path.Combine(dir, $"tcwv_{frames}_{c.Item1}_t{c.Item2}.zarr");
            if (!Directory.Exists(path)) Measure.Run(python, $"\"{Path.Combine(peers, "zarr_write.py")}\" \"{path}\" {frames} {Rows} {Columns} {c.Item2} {c.Item1}");
            return (Label: $"Zarr v2, {(c.Item1 == "blosc" ? "blosc-lz4" : "zstd")}, {c.Item2}-frame chunks", Path: path);
        }).ToList();

        Console.WriteLine($"formats benchmark: {frames} frames of {Rows} × {Columns} float32, {Environment.ProcessorCount} cores");
        // the GRIB peer either decodes every message, or first reads each one's shortName as a
        // script must to pick a variable out of a file (GridDrift opens the variable by name);
        // GridDrift opens the file either for the first time (its index built) or again (the index
        // remembered from an earlier run)
        var firstOpen = new Dictionary<string, string> { ["GRIDDRIFT_GRIB_INDEX_CACHE"] = "off" };
        var cases = new List<(string Label, string Path, string Peer, string PeerName, Dictionary<string, string>? Env)>();
        foreach (var (peer, peerName) in new[] { ("grib_read.py", "python3-eccodes, every message"), ("grib_read.py --by-name", "python3-eccodes, by shortName") })
        {
            cases.Add(("GRIB 2, first open", grib, peer, peerName, firstOpen));
            cases.Add(("GRIB 2, index remembered", grib, peer, peerName, null));
        }
        cases.AddRange(stores.Select(s => (s.Label, s.Path, "zarr_read.py", "python3-zarr", (Dictionary<string, string>?)null)));
        foreach (var (label, path, peer, peerName, env) in cases)
        {
            Warm(path);
            Measure.Run(self, $"{selfArgs}formats-one \"{path}\" tcwv", env); // caches as a user's second run finds them
            Timing ours = new(double.PositiveInfinity, 0, 0), theirs = new(double.PositiveInfinity, 0, 0);
            for (int round = 0; round < 5; round++)
            {
                var o = Parse(Measure.Run(self, $"{selfArgs}formats-one \"{path}\" tcwv", env));
                if (o.Seconds < ours.Seconds) ours = o;
                string script = peer.Split(' ')[0], options = peer[script.Length..];
                var p = Parse(Measure.Run(python, $"\"{Path.Combine(peers, script)}\" \"{path}\" tcwv{options}"));
                if (p.Seconds < theirs.Seconds) theirs = p;
            }
            Console.WriteLine($"  {label,-36} GridDrift {frames / ours.Seconds,6:0} frames/s (peak {ours.PeakMiB,5:0} MiB) | {peerName,-31} {frames / theirs.Seconds,6:0} frames/s" +
                              $" (peak {theirs.PeakMiB,5:0} MiB) | ratio {theirs.Seconds / ours.Seconds:0.00}× | sums agree: {Math.Abs(ours.Sum - theirs.Sum) <= 1e-6 * Math.Abs(theirs.Sum)}");
        }
        return 0;
    }

    sealed record Timing(double Seconds, double PeakMiB, double Sum);

    static Timing Parse(string line)
    {
        var parts = line.Split(' ');
        return new Timing(double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture), double.Parse(parts[2], CultureInfo.InvariantCulture));
    }

    static void Warm(string path)
    {
        if (File.Exists(path)) Measure.Warm(path);
        else foreach (var file in Directory.EnumerateFiles(path, "*", SearchOption.AllDirectories)) Measure.Warm(file);
    }

    /// <summary>The measured reader: every frame read by the frame engine's workers and summed in float64, the sums added in time order.</summary>
    public static int RunOne(string[] args)
    {
        var clock = Stopwatch.StartNew();
        using var source = FrameSource.Open([args[0]], args[1]);
        var sum = new FrameSum();
        FrameEngine.Run(source, Enumerable.Range(0, source.FrameCount).ToArray(), sum, EngineSettings.Default);
        clock.Stop();
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{clock.Elapsed.TotalSeconds:0.0000} {Measure.PeakResidentMiB():0.0} {sum.Total:0.000000e+00}"));
        return 0;
    }

    sealed class FrameSum : IFrameOperator<double[]>
    {
        public double Total;

        public double[] NewWorker() => new double[1];

        /// <summary>The frame's sum over cells with values, in float64 lanes (the peers sum with numpy, also in vector lanes).</summary>
        public void Process(double[] worker, int frame, in FrameInputs inputs)
        {
            var values = inputs.Primary;
            var acc = System.Runtime.Intrinsics.Vector256<double>.Zero;
            int i = 0;
            for (; i + 8 <= values.Length; i += 8)
            {
                var v = System.Runtime.Intrinsics.Vector256.Create(values.Slice(i, 8));
                var (low, high) = System.Runtime.Intrinsics.Vector256.Widen(v & System.Runtime.Intrinsics.Vector256.Equals(v, v));
                acc += low + high;
            }
            double s = System.Runtime.Intrinsics.Vector256.Sum(acc);
            for (; i < values.Length; i++) if (!float.IsNaN(values[i])) s += values[i];
            worker[0] = s;
        }

        public void Complete(double[] worker, int frame) => Total += worker[0];
    }
}
