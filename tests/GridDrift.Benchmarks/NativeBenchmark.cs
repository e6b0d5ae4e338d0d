using System.Globalization;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Operators.Climatology;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Workflows;

namespace GridDrift.Benchmarks;

/// <summary>
/// Imagery at native resolution: frames of 3712 × 3712 cells (a geostationary full disk's
/// size, here on an invented global latitude-longitude grid) over global + tiles:20x20 (163
/// regions). Each command runs in its own process, which reports its wall time and peak
/// resident memory: similarity with SSIM and VIF, VIF alone over the globe, and stats with all
/// eight statistics. Time per pair or frame includes reading, setup and writing.
/// </summary>
internal static class NativeBenchmark
{
    public const int Side = 3712;
    internal static readonly string[] Regions = ["global", "tiles:20x20"];

    public static int Run(string[] args)
    {
        if (args.FirstOrDefault() == "project") return DecadeProjection.Run(args[1..]);
        int frames = args.Length > 0 && !args[0].StartsWith('-') ? int.Parse(args[0], CultureInfo.InvariantCulture) : 8;
        string dir = args.SkipWhile(a => a != "--dir").Skip(1).FirstOrDefault() ?? Path.Combine(Path.GetTempPath(), "griddrift-native");
        Directory.CreateDirectory(dir);
        string path = Path.Combine(dir, $"wv_native_{frames}.nc");
        if (!File.Exists(path)) WriteRecord(path, frames);
        Console.WriteLine($"native-resolution benchmark: {frames} frames of {Side} × {Side} float32 ({4.0 * Side * Side / 1e6:0} MB each), global + tiles:20x20, {Environment.ProcessorCount} cores");
        Console.WriteLine($"  {"command",-44} {"per pair/frame",16} {"peak memory",12}");
        foreach (var (command, label, units) in new[]
        {
            ("ssim-vif", "similarity --metric ssim,vif", frames - 1),
            ("vif-global", "similarity --metric vif, global only", frames - 1),
            ("stats", "stats, all eight statistics", frames),
        })
        {
            var (seconds, peak) = Child(command, path);
            Console.WriteLine($"  {label,-44} {seconds / units,14:0.00} s {peak / 1024,9:0.00} GB");
        }
        return 0;
    }

    internal static (double Seconds, double PeakMiB) Child(string command, params string[] files)
    {
        var r = ChildRun(command, files);
        return (r.Seconds, r.PeakMiB);
    }

    /// <summary>One command in its own process: wall time, peak resident memory, and the time after its last frame (writing the products).</summary>
    internal static (double Seconds, double PeakMiB, double Closing) ChildRun(string command, params string[] arguments)
    {
        string self = Environment.ProcessPath!;
        string selfArgs = self.EndsWith("dotnet") ? $"\"{typeof(NativeBenchmark).Assembly.Location}\" " : "";
        var parts = Measure.Run(self, $"{selfArgs}native-one {command} {string.Join(' ', arguments.Select(f => $"\"{f}\""))}").Split(' ');
        return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture), double.Parse(parts[2], CultureInfo.InvariantCulture));
    }

    public static int RunOne(string[] args)
    {
        string command = args[0];
        var files = args[1..];
        string output = Path.Combine(Path.GetTempPath(), $"griddrift-native-out-{Environment.ProcessId}.nc");
        var clock = System.Diagnostics.Stopwatch.StartNew();
        double lastFrame = double.NaN;
        var progress = new Progress(() => lastFrame = clock.Elapsed.TotalSeconds);
        switch (command)
        {
            case "ssim-vif":
                SimilarityStep.Run(new SimilarityOptions(files, "wv", Regions, [SimilarityMetric.Ssim, SimilarityMetric.Vif], output, Range: "180:320"), progress);
                break;
            case "vif-global":
                SimilarityStep.Run(new SimilarityOptions(files, "wv", ["global"], [SimilarityMetric.Vif], output, Range: "180:320"), progress);
                break;
            case "stats":
                StatsStep.Run(new StatsOptions(files, "wv", Regions, RegionStatistics.All, output), progress);
                break;
            case "climatology-month":
                ClimatologyStep.Run(new ClimatologyOptions(files, "wv", ClimatologyKinds.Parse("month")!.Value, output), progress);
                break;
            case "shard":
                GridDrift.Pipeline.RecipeRunner.Run(files[0], shard: GridDrift.Pipeline.ShardSpec.Parse(files[1]));
                break;
            case "gather":
                GridDrift.Pipeline.ShardGather.Run(files[1..], files[0]);
                break;
            case "read":
                using (var source = GridDrift.Frames.FrameSource.Open(files, "wv"))
                {
                    var buffers = new[] { new float[source.FrameLength], new float[source.FrameLength] };
                    Parallel.For(0, 2, w => { for (int t = w; t < source.FrameCount; t += 2) source.ReadFrame(t, buffers[w]); });
                }
                break;
            default:
                throw new ArgumentException($"unknown command {command}");
        }
        double total = clock.Elapsed.TotalSeconds;
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{total:0.000} {Measure.PeakResidentMiB():0} {(double.IsNaN(lastFrame) ? 0 : total - lastFrame):0.000}"));
        if (File.Exists(output)) File.Delete(output);
        return 0;
    }

    /// <summary>Reports synchronously (IProgress's default posts to the thread pool, which would stamp late).</summary>
    sealed class Progress(Action reported) : IProgress<(int Done, int Total)>
    {
        public void Report((int Done, int Total) value) => reported();
    }

    /// <summary>An invented hourly water-vapour brightness temperature: a latitude profile, a travelling wave, fine structure and noise.</summary>
    internal static void WriteRecord(string path, int frames)
    {
        string partial = path + ".part";
        using (var w = ClassicWriter.Create(partial, ClassicVariant.Cdf5))
        {
            var (vt, v) = InventedRecords.Begin(w, "invented hourly water-vapour-channel brightness temperature at native resolution, for the benchmark", "wv",
                Enumerable.Range(0, Side).Select(j => 90 - 180.0 * (j + 0.5) / Side).ToArray(), Enumerable.Range(0, Side).Select(i => 360.0 * (i + 0.5) / Side).ToArray());
            var frame = new float[Side * Side];
            var profile = Enumerable.Range(0, Side).Select(j => 235 + 25 * Math.Cos((90 - 180.0 * (j + 0.5) / Side) * Math.PI / 180)).ToArray();
            for (int t = 0; t < frames; t++)
            {
                Parallel.For(0, Side, j =>
                {
                    ulong state = 0x9E3779B97F4A7C15UL ^ (ulong)(t * Side + j + 1) * 0xBF58476D1CE4E5B9UL;
                    for (int i = 0; i < Side; i++)
                    {
                        state ^= state << 13; state ^= state >> 7; state ^= state << 17;
                        double noise = (state >> 40) * (1.0 / (1 << 24)) - 0.5;
                        double x = 2 * Math.PI * i / Side, y = Math.PI * j / Side;
                        frame[j * Side + i] = (float)(profile[j] + 8 * Math.Sin(2 * x + 0.05 * t) * Math.Sin(3 * y) + 3 * Math.Sin(40 * x - 0.2 * t) * Math.Cos(35 * y) + 2 * noise);
                    }
                });
                w.WriteRecord<double>(vt, t, [t]);
                w.WriteRecord<float>(v, t, frame);
            }
            w.Commit();
        }
        File.Move(partial, path, true);
    }
}
