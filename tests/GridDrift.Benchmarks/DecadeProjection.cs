using System.Globalization;
using GridDrift.Formats.Nc4;

namespace GridDrift.Benchmarks;

/// <summary>
/// The decade-scale projection: the chain stats (all eight statistics) + similarity (SSIM and
/// VIF) + month climatology over FRAMES (≥ 50) frames of 3712 × 3712 from a deflate-compressed
/// NetCDF-4 record (deflate 1 with shuffle, one frame a chunk, as `griddrift convert` writes it),
/// each command in its own process. The time per frame is split into reading (a read-only pass
/// over an uncompressed copy), decompression (the same pass over the NetCDF-4 record, less
/// reading), writing (after the last frame) and the rest (kernels, with per-frame series rows
/// and setup). Then it runs the chain as a recipe in 4 shards and gathers them, and takes each
/// shard's fixed cost (its time less its frames at the chain's rate) and the gather's cost per
/// shard (it merges every shard's partial climatology state, whose size does not depend on the
/// shard's length). Projects 90,000 frames (a decade of hourly full-disk images) on this machine and on
/// a 16-node Slurm array of such machines.
/// </summary>
internal static class DecadeProjection
{
    const int DecadeFrames = 90_000, Nodes = 16, TrialShards = 4;

    public static int Run(string[] args)
    {
        int frames = args.Length > 0 && !args[0].StartsWith('-') ? int.Parse(args[0], CultureInfo.InvariantCulture) : 50;
        string dir = args.SkipWhile(a => a != "--dir").Skip(1).FirstOrDefault() ?? Path.Combine(Path.GetTempPath(), "griddrift-native");
        if (!Nc4Options.Available(out string why))
        {
            Console.WriteLine($"decade projection skipped: the NetCDF-4 writer needs netCDF-C ({why})");
            return 0;
        }
        Directory.CreateDirectory(dir);
        string classic = Path.Combine(dir, $"wv_native_{frames}.nc"), deflate = Path.Combine(dir, $"wv_native_{frames}_deflate1.nc");
        if (!File.Exists(classic)) NativeBenchmark.WriteRecord(classic, frames);
        if (!File.Exists(deflate)) Nc4Converter.Convert(classic, deflate, new Nc4Options(1, true));
        Console.WriteLine($"decade projection: {frames} frames of {NativeBenchmark.Side} × {NativeBenchmark.Side}, deflate-1+shuffle NetCDF-4 " +
            $"({new FileInfo(deflate).Length / 1e9:0.00} GB against {new FileInfo(classic).Length / 1e9:0.00} GB uncompressed), global + tiles:20x20, {Environment.ProcessorCount} cores");

        Measure.Warm(classic);
        Measure.Warm(deflate);
        double read = NativeBenchmark.ChildRun("read", classic).Seconds / frames;
        double decompress = Math.Max(0, NativeBenchmark.ChildRun("read", deflate).Seconds / frames - read);
        Console.WriteLine($"  reading {read * 1e3:0} ms/frame (uncompressed, page cache); decompression {decompress * 1e3:0} ms/frame more (two workers, a reader each)");

        Console.WriteLine($"  {"command",-28} {"s/frame",8} {"read",6} {"decomp.",8} {"kernels",8} {"writing",8} {"peak",8}");
        double perFrame = 0, writing = 0, readAll = 0, decompressAll = 0, kernelsAll = 0;
        foreach (var (command, label) in new[] { ("stats", "stats (all eight)"), ("ssim-vif", "similarity ssim,vif"), ("climatology-month", "climatology month") })
        {
            var r = NativeBenchmark.ChildRun(command, deflate);
            double looped = (r.Seconds - r.Closing) / frames, kernels = looped - read - decompress;
            perFrame += looped;
            writing += r.Closing;
            readAll += read;
            decompressAll += decompress;
            kernelsAll += kernels;
            Console.WriteLine($"  {label,-28} {r.Seconds / frames,8:0.000} {read,6:0.000} {decompress,8:0.000} {kernels,8:0.000} {r.Closing,7:0.0}s {r.PeakMiB / 1024,6:0.00}GB");
        }
        double hours = (perFrame * DecadeFrames + writing) / 3600;
        Console.WriteLine($"  chain: {perFrame:0.000} s/frame = read {readAll:0.000} + decompress {decompressAll:0.000} + kernels {kernelsAll:0.000}, plus {writing:0.0} s writing at the end");
        Console.WriteLine($"  projected for {DecadeFrames:N0} frames on this machine: {hours:0.0} h (goal 14 h)");

        // the chain as a recipe, in shards: each shard's fixed cost, and the gather's
        string work = Path.Combine(dir, "shards-trial");
        if (Directory.Exists(work)) Directory.Delete(work, true);
        Directory.CreateDirectory(work);
        string recipe = Path.Combine(work, "recipe.toml");
        File.WriteAllText(recipe, $"""
            [input]
            files = ["{deflate}"]
            variable = "wv"
            regions = ["global", "tiles:20x20"]
            out = "products"

            [stats]
            stat = "mean,std,min,max,p10,p50,p90,valid"

            [similarity]
            metric = "ssim,vif"
            range = "180:320"

            [climatology]
            by = "month"
            """);
        double shardSeconds = 0;
        var folders = new List<string>();
        for (int i = 1; i <= TrialShards; i++)
        {
            shardSeconds += NativeBenchmark.ChildRun("shard", recipe, $"{i}/{TrialShards}").Seconds;
            folders.Add(Path.Combine(work, "products", "shards", $"shard-{i:00}-of-{TrialShards:00}"));
        }
        double fixedPerShard = Math.Max(0, (shardSeconds - perFrame * frames) / TrialShards);
        double gather = NativeBenchmark.ChildRun("gather", [Path.Combine(work, "gathered"), .. folders]).Seconds;
        // the gather merges each shard's partial climatology state (slots × cells, the same size whatever the shard's length): it grows with the shards
        double gatherPerShard = gather / TrialShards;
        double nodeHours = (fixedPerShard + perFrame * DecadeFrames / Nodes + writing) / 3600, gatherHours = gatherPerShard * Nodes / 3600;
        Console.WriteLine($"  {TrialShards} shards: {shardSeconds:0.0} s in all, a fixed {fixedPerShard:0.0} s per shard beyond its frames; gather {gather:0.0} s ({gatherPerShard:0.0} s per shard)");
        Console.WriteLine($"  projected for {DecadeFrames:N0} frames on a {Nodes}-node Slurm array of such machines: {nodeHours + gatherHours:0.00} h " +
            $"({nodeHours:0.00} h per shard, in parallel, + {gatherHours * 60:0} min gather), if the shared file system gives each node " +
            $"{new FileInfo(deflate).Length / (double)frames * 3 / perFrame / 1e6:0} MB/s of compressed frames");
        return 0;
    }
}
