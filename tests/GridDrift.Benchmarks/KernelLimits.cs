using System.Diagnostics;
using System.Runtime.Intrinsics;
using GridDrift.Grids;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Regions;

namespace GridDrift.Benchmarks;

/// <summary>
/// How far each kernel is from this machine's limits. Measures the vector arithmetic rate (eight
/// independent float32 fused multiply-add chains per thread, 256-bit) and the memory read rate
/// (summing a 1 GiB array), on one core and on all; then times each kernel on one core on
/// 721 × 1440 frames and sets its time per cell against the time its arithmetic and its memory
/// traffic would take at those rates. Arithmetic and bytes per cell are counted from the
/// kernels' code (a fused multiply-add counts two operations; zero taps of blocked filters count).
/// </summary>
internal static class KernelLimits
{
    const int Rows = 721, Columns = 1440, Cells = Rows * Columns;

    /// <summary>Counted per cell: float operations and bytes to and from memory (not cache).</summary>
    static readonly (string Kernel, double Flops, double Bytes)[] Counts =
    [
        // valid sums (6); mask, shift and square (8); along rows 4 fields × 16; down 4 fields × 14 inputs × 2 (blocked); combine 18 (float32, two divisions);
        // reads 2 frames twice (sums, filter), writes the map
        ("SSIM map", 6 + 8 + 4 * 16 + 4 * 28 + 18, 20),
        // valid sums (6); level 0: rescale 6, products 3, along 5 × 25, down 5 × 40 (blocked), terms ~25 + two logarithms ~40; pyramid prefilter 2 × 13 full rows + 6.5;
        // coarser levels ~0.33 × 250 (their logarithms at the second scale only); reads 2 frames twice, writes two maps
        ("VIF term maps", 6 + 9 + 125 + 200 + 65 + 33 + 83, 24),
        // two distinct longitude ranges (global and bands share one): 2 × (load, mask, 3 sums ≈ 10); reads each cell once per range
        ("stats: mean, std, min, max, valid", 20, 8),
        // the above, bin the frame (4), histogram three memberships (2 each), pick test (3 × 1); bins written once and read twice per membership
        ("stats: all eight (p10, p50, p90)", 20 + 4 + 6 + 3, 8 + 4 + 2 + 12),
    ];

    public static int Run(string[] args)
    {
        int threads = Environment.ProcessorCount;
        double flops1 = FmaRate(1), flopsAll = FmaRate(threads);
        double bandwidth1 = ReadRate(1), bandwidthAll = ReadRate(threads);
        Console.WriteLine($"kernel limits: {threads} cores; vector arithmetic {flops1 / 1e9:0.0} Gflop/s on one core, {flopsAll / 1e9:0.0} on all; " +
            $"memory reads {bandwidth1 / 1e9:0.0} GB/s on one core, {bandwidthAll / 1e9:0.0} on all");
        Console.WriteLine($"  {"kernel (one core, 721 × 1440)",-36} {"ns/cell",8} {"flop/cell",10} {"B/cell",7} {"arith. limit",13} {"memory limit",13} {"of the limit",13}");
        var rng = new Random(5);
        var a = Enumerable.Range(0, Cells).Select(_ => (float)(240 + 20 * rng.NextDouble())).ToArray();
        var b = a.Select(v => v + (float)rng.NextDouble()).ToArray();
        var grid = RectilinearGrid.Build(Enumerable.Range(0, Rows).Select(i => 90 - 0.25 * i).ToArray(), Enumerable.Range(0, Columns).Select(i => 0.25 * i).ToArray());
        var regions = RegionSet.Build(grid, RegionSpecs.Parse(["global", "bands:20", "tiles:20x20"]));
        var ssim = new Ssim(Rows, Columns, true, 180, 320);
        var vif = new VifField(Rows, Columns, true, 180, 320);
        var map = new float[Cells];
        var den = new float[Cells];
        var means = new RegionReducer(regions, [RegionStatistic.Mean, RegionStatistic.Std, RegionStatistic.Min, RegionStatistic.Max, RegionStatistic.Valid]);
        var all = new RegionReducer(regions, RegionStatistics.All);
        var output = new double[regions.Count * RegionStatistics.All.Length];
        var kernels = new Action[] { () => ssim.Map(a, b, map), () => vif.Terms(a, b, map, den), () => means.Reduce(a, output), () => all.Reduce(a, output) };
        for (int k = 0; k < kernels.Length; k++)
        {
            double seconds = Time(kernels[k]);
            var (name, flops, bytes) = Counts[k];
            double perCell = seconds / Cells, arithmetic = flops / flops1, memory = bytes / bandwidth1;
            Console.WriteLine($"  {name,-36} {perCell * 1e9,8:0.00} {flops,10:0} {bytes,7:0} {arithmetic * 1e9,10:0.00} ns {memory * 1e9,10:0.00} ns {Math.Max(arithmetic, memory) / perCell,12:0%}");
        }
        return 0;
    }

    /// <summary>Seconds per call after 1.5 s of warm-up (past the JIT's tiers).</summary>
    static double Time(Action kernel)
    {
        for (var warm = Stopwatch.StartNew(); warm.Elapsed.TotalSeconds < 1.5;) kernel();
        int calls = 0;
        var clock = Stopwatch.StartNew();
        while (clock.Elapsed.TotalSeconds < 2) { kernel(); calls++; }
        return clock.Elapsed.TotalSeconds / calls;
    }

    static double FmaRate(int threads)
    {
        const long Iterations = 100_000_000;
        var clock = Stopwatch.StartNew();
        Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, t =>
        {
            var x = Vector256.Create(1.0000001f); var y = Vector256.Create(0.9999999f);
            Vector256<float> a0 = Vector256.Create(t + 1f), a1 = a0, a2 = a0, a3 = a0, a4 = a0, a5 = a0, a6 = a0, a7 = a0;
            for (long i = 0; i < Iterations; i++)
            {
                a0 = Vector256.FusedMultiplyAdd(a0, x, y); a1 = Vector256.FusedMultiplyAdd(a1, x, y);
                a2 = Vector256.FusedMultiplyAdd(a2, x, y); a3 = Vector256.FusedMultiplyAdd(a3, x, y);
                a4 = Vector256.FusedMultiplyAdd(a4, x, y); a5 = Vector256.FusedMultiplyAdd(a5, x, y);
                a6 = Vector256.FusedMultiplyAdd(a6, x, y); a7 = Vector256.FusedMultiplyAdd(a7, x, y);
            }
            if (Vector256.Sum(a0 + a1 + a2 + a3 + a4 + a5 + a6 + a7) == 0) Console.Write("");
        });
        return threads * Iterations * 8.0 * 8 * 2 / clock.Elapsed.TotalSeconds;
    }

    static double ReadRate(int threads)
    {
        var data = new float[256 << 20];
        Array.Fill(data, 1f);
        double best = 0;
        for (int round = 0; round < 3; round++)
        {
            var clock = Stopwatch.StartNew();
            int share = data.Length / threads;
            Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, t =>
            {
                if (System.Numerics.Tensors.TensorPrimitives.Sum(data.AsSpan(t * share, share)) == 0) Console.Write("");
            });
            best = Math.Max(best, 4.0 * data.Length / clock.Elapsed.TotalSeconds);
        }
        return best;
    }
}
