using System.Diagnostics;
using System.Globalization;
using GridDrift.Operators.Climatology;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Pipeline;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Results;
using GridDrift.Workflows;

namespace GridDrift.Benchmarks;

/// <summary>
/// The long-record figures: one year of hourly 0.5° frames (8,760 × 361 × 720 float32, 9.1 GB
/// in files of 1,000 frames) through stats, similarity and climatology on this machine, each
/// command in its own process: frames per second and peak memory, over the first 1,000 frames
/// and over the year (memory must not grow with the record). Where the time goes: a read-only
/// pass (page cache), the same 1,000 frames read from a deflate NetCDF-4 copy (decompression),
/// the input checksums (once per file, remembered after), and the rest of each command (kernels
/// and writing). Ends with the time extrapolated to a 15-year hourly 0.25° record (131,400
/// frames, 4 × the cells) on one such machine and on N cluster nodes.
/// </summary>
internal static class LongRecordBenchmark
{
    const int Rows = 361, Columns = 720, FramesPerFile = 1000;
    static readonly string[] Regions = ["global", "bands:10", "tiles:30x60"];

    public static int Run(string[] args)
    {
        int frames = args.Length > 0 && !args[0].StartsWith('-') ? int.Parse(args[0], CultureInfo.InvariantCulture) : 8760;
        string dir = args.SkipWhile(a => a != "--dir").Skip(1).FirstOrDefault() ?? Path.Combine(Path.GetTempPath(), "griddrift-long");
        Directory.CreateDirectory(dir);
        string self = Environment.ProcessPath!;
        string selfArgs = self.EndsWith("dotnet") ? $"\"{typeof(LongRecordBenchmark).Assembly.Location}\" " : "";
        Console.WriteLine($"long-record benchmark: {frames} hourly {Rows} × {Columns} float32 frames (0.5°), {Environment.ProcessorCount} cores, {GC.GetGCMemoryInfo().TotalAvailableMemoryBytes / (1L << 30)} GiB");

        var clock = Stopwatch.StartNew();
        var files = new List<string>();
        for (int first = 0; first < frames; first += FramesPerFile)
        {
            string path = Path.Combine(dir, $"tb_hourly_05deg_{first / FramesPerFile:00}.nc");
            int n = Math.Min(FramesPerFile, frames - first);
            if (!File.Exists(path) || new FileInfo(path).Length < (long)n * Rows * Columns * 4) WriteFile(path, first, n);
            files.Add(path);
        }
        double gigabytes = files.Sum(f => new FileInfo(f).Length) / 1e9;
        Console.WriteLine($"  record: {files.Count} files, {gigabytes:0.0} GB, ready in {clock.Elapsed.TotalSeconds:0} s");

        clock.Restart();
        GridDrift.Formats.FileHash.Sha256(files[0]);
        double hashRate = new FileInfo(files[0]).Length / 1e9 / clock.Elapsed.TotalSeconds;
        foreach (var f in files) GridDrift.Formats.ChecksumCache.Sha256(f); // remembered for the commands below, as after any first command
        Console.WriteLine($"  input checksums: SHA-256 at {hashRate:0.00} GB/s, {gigabytes / hashRate:0.0} s for the record once; remembered by path, size and time after");

        string compressed = Path.Combine(dir, "tb_hourly_05deg_00_deflate1.nc");
        if (!File.Exists(compressed)) GridDrift.Formats.Nc4.Nc4Converter.Convert(files[0], compressed, new GridDrift.Formats.Nc4.Nc4Options(1, true));
        var classicRead = Child(self, selfArgs, "read", [files[0]]);
        var deflateRead = Child(self, selfArgs, "read", [compressed]);
        double perFrameDecompress = (deflateRead.Seconds - classicRead.Seconds) / FramesPerFile * 1e3;
        Console.WriteLine($"  read {FramesPerFile} frames: CDF-2 {classicRead.Seconds:0.00} s ({FramesPerFile / classicRead.Seconds:0} frames/s), deflate-1+shuffle NetCDF-4 " +
            $"({new FileInfo(compressed).Length / 1e9:0.00} GB against {new FileInfo(files[0]).Length / 1e9:0.00}) {deflateRead.Seconds:0.00} s: decompression {perFrameDecompress:0.0} ms/frame");
        var fullRead = Child(self, selfArgs, "read", files);
        Console.WriteLine($"  read-only pass over {frames} frames: {fullRead.Seconds:0.0} s, {frames / fullRead.Seconds:0} frames/s, {gigabytes / fullRead.Seconds:0.00} GB/s, peak {fullRead.PeakMiB:0} MiB");

        var perFrame = new Dictionary<string, double>();
        foreach (var command in new[] { "stats", "similarity", "climatology-month", "climatology-hour-by-month" })
        {
            var small = Child(self, selfArgs, command, files.Take(1).ToList());
            var large = Child(self, selfArgs, command, files);
            perFrame[command] = large.Seconds / frames;
            Console.WriteLine($"  {command,-26} {FramesPerFile,5} frames: {small.Seconds,6:0.0} s, peak {small.PeakMiB,5:0} MiB | {frames} frames: {large.Seconds,6:0.0} s, " +
                $"{frames / large.Seconds,5:0} frames/s, peak {large.PeakMiB,5:0} MiB | reading {100 * fullRead.Seconds / large.Seconds:0}% of it");
        }

        // 15 years of hourly 0.25° frames: 131,400 frames of 4 × the cells; the per-frame costs scale with the cells
        const int longFrames = 131_400;
        double chain = 4 * (perFrame["stats"] + perFrame["similarity"] + perFrame["climatology-month"]);
        double oneMachineHours = chain * longFrames / 3600;
        double deflateHours = (chain + 3 * 4 * perFrameDecompress / 1e3) * longFrames / 3600;
        double bytesPerFrame = 4.0 * Rows * Columns * 4, perNode = 3 * bytesPerFrame / chain / 1e9;
        Console.WriteLine($"  extrapolated to 15 years of hourly 0.25° frames ({longFrames} frames, {longFrames * bytesPerFrame / 1e9:0} GB), stats + similarity + monthly climatology, " +
            $"each reading the record once: {oneMachineHours:0.0} h on one 2-core machine like this one from uncompressed files in the page cache, {deflateHours:0.0} h from deflate-1 NetCDF-4; " +
            $"in N shards on N such nodes {oneMachineHours:0.0}/N h (N = 16: {oneMachineHours / 16 * 60:0} min, {deflateHours / 16 * 60:0} min from NetCDF-4) plus the gather, " +
            $"if the shared file system gives each node {perNode:0.00} GB/s");
        return 0;
    }

    /// <summary>One command in its own process: its wall time and peak resident memory.</summary>
    static (double Seconds, double PeakMiB) Child(string self, string selfArgs, string command, IReadOnlyList<string> files)
    {
        var parts = Measure.Run(self, $"{selfArgs}longrecord-one {command} {string.Join(' ', files.Select(f => $"\"{f}\""))}").Split(' ');
        return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture));
    }

    public static int RunOne(string[] args)
    {
        string command = args[0];
        var files = args[1..];
        string output = Path.Combine(Path.GetTempPath(), $"griddrift-long-out-{Environment.ProcessId}.nc");
        var clock = Stopwatch.StartNew();
        switch (command)
        {
            case "read":
                using (var source = FrameSource.Open(files, "tb"))
                {
                    var buffers = new[] { new float[source.FrameLength], new float[source.FrameLength] };
                    Parallel.For(0, 2, w => { for (int t = w; t < source.FrameCount; t += 2) source.ReadFrame(t, buffers[w]); });
                }
                break;
            case "stats":
                StatsStep.Run(new StatsOptions(files, "tb", Regions, [RegionStatistic.Mean, RegionStatistic.Std, RegionStatistic.Valid], output));
                break;
            case "similarity":
                SimilarityStep.Run(new SimilarityOptions(files, "tb", Regions, [SimilarityMetric.Ssim, SimilarityMetric.Corr, SimilarityMetric.Rmsd], output, Range: "180:320"));
                break;
            default:
                ClimatologyStep.Run(new ClimatologyOptions(files, "tb", ClimatologyKinds.Parse(command["climatology-".Length..])!.Value, output));
                break;
        }
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{clock.Elapsed.TotalSeconds:0.000} {Measure.PeakResidentMiB():0}"));
        if (File.Exists(output)) File.Delete(output);
        return 0;
    }

    /// <summary>An invented hourly field: a latitude profile, a diurnal cycle, an eastward travelling wave and noise.</summary>
    static void WriteFile(string path, int firstFrame, int frames)
    {
        using var w = ClassicWriter.Create(path);
        var (vt, v) = InventedRecords.Begin(w, "invented hourly water-vapour-channel brightness temperature for the long-record benchmark", "tb",
            Enumerable.Range(0, Rows).Select(j => 90.0 - 0.5 * j).ToArray(), Enumerable.Range(0, Columns).Select(i => 0.5 * i).ToArray());
        var profile = Enumerable.Range(0, Rows).Select(j => 235 + 25 * Math.Cos((90 - 0.5 * j) * Math.PI / 180)).ToArray();
        var wave = Enumerable.Range(0, Columns).Select(i => Math.Sin(4 * Math.PI * i / Columns)).ToArray();
        var frame = new float[Rows * Columns];
        ulong state = 0x9E3779B97F4A7C15UL ^ (ulong)firstFrame;
        for (int t = 0; t < frames; t++)
        {
            int hour = firstFrame + t, shift = hour % Columns;
            double day = 2 * Math.Cos(2 * Math.PI * (hour % 24) / 24.0), season = 6 * Math.Sin(2 * Math.PI * hour / 8760.0);
            for (int j = 0; j < Rows; j++)
                for (int i = 0; i < Columns; i++)
                {
                    state ^= state << 13; state ^= state >> 7; state ^= state << 17;
                    double noise = (state >> 40) * (1.0 / (1 << 24)) - 0.5;
                    frame[j * Columns + i] = (float)(profile[j] + season + day + 8 * wave[(i + shift) % Columns] + 2 * noise);
                }
            w.WriteRecord<double>(vt, t, [hour]);
            w.WriteRecord<float>(v, t, frame);
        }
        w.Commit();
    }
}
