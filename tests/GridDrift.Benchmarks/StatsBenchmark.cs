using System.Diagnostics;
using System.Globalization;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Operators.Statistics;

namespace GridDrift.Benchmarks;

/// <summary>
/// Region reductions of 721 × 1440 float32 frames over global + bands:20 + tiles:20x20 (172
/// regions): GridDrift's reducer on one core and on all cores against numpy masked weighted
/// means (peers/numpy_region_means.py) on frames of the same size in the same run.
/// </summary>
internal static class StatsBenchmark
{
    public static int Run(string[] args)
    {
        int frames = args.Length > 0 ? int.Parse(args[0], CultureInfo.InvariantCulture) : 200;
        double[] lat = Enumerable.Range(0, 721).Select(i => 90 - 0.25 * i).ToArray();
        double[] lon = Enumerable.Range(0, 1440).Select(i => 0.25 * i).ToArray();
        var build = Stopwatch.StartNew();
        var grid = RectilinearGrid.Build(lat, lon);
        var shapes = RegionSpecs.Parse(["global", "bands:20", "tiles:20x20"]);
        var mask = RegionMaskBuilder.Build(grid, shapes);
        var regions = RegionSet.Build(grid, shapes);
        build.Stop();
        var rng = new Random(3);
        var data = Enumerable.Range(0, 4).Select(_ => Enumerable.Range(0, grid.CellCount).Select(_ => (float)(250 + 20 * (rng.NextDouble() - 0.5))).ToArray()).ToArray();
        foreach (var f in data) for (int j = 100; j < 120; j++) for (int i = 200; i < 400; i++) f[j * 1440 + i] = float.NaN;
        double frameMB = grid.CellCount * 4 / 1e6;
        Console.WriteLine($"stats benchmark: {frames} frames of 721 × 1440 float32, {mask.Count} regions, {mask.EntryCount:N0} mask entries (mask built in {build.Elapsed.TotalSeconds:0.00} s), {Environment.ProcessorCount} cores");

        string peer = Measure.Run("/usr/bin/python3", $"\"{Path.Combine(AppContext.BaseDirectory, "peers", "numpy_region_means.py")}\" {Math.Max(10, frames / 10)}");
        double numpy = double.Parse(peer.Split(' ')[0], CultureInfo.InvariantCulture);
        Console.WriteLine($"  numpy masked weighted means: {numpy * 1000:0.00} ms/frame");

        foreach (var (label, stats) in new[] { ("mean", new[] { RegionStatistic.Mean, RegionStatistic.Valid }), ("mean,std,min,max,valid", new[] { RegionStatistic.Mean, RegionStatistic.Std, RegionStatistic.Min, RegionStatistic.Max, RegionStatistic.Valid }), ("all eight (with p10, p50, p90)", RegionStatistics.All) })
        {
            foreach (int workers in new[] { 1, Environment.ProcessorCount })
            {
                var reducers = Enumerable.Range(0, workers).Select(_ => new RegionReducer(regions, stats)).ToArray();
                var outputs = Enumerable.Range(0, workers).Select(_ => new double[mask.Count * stats.Length]).ToArray();
                int n = label.StartsWith("all") ? Math.Max(4, frames / 2) : frames;
                // warm up past the JIT's tiers (a real run reduces thousands of frames)
                Parallel.For(0, workers, w => { for (int i = 0; i < 6; i++) reducers[w].Reduce(data[i % 4], outputs[w]); });
                var clock = Stopwatch.StartNew();
                Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
                {
                    for (int i = w; i < n; i += workers) reducers[w].Reduce(data[i % 4], outputs[w]);
                });
                clock.Stop();
                double perFrame = clock.Elapsed.TotalSeconds / n;
                Console.WriteLine($"  GridDrift {label,-31} {workers} core(s): {perFrame * 1000,7:0.00} ms/frame, {frameMB / perFrame / 1000,5:0.00} GB/s, {numpy / perFrame,6:0.0}× numpy (means)");
            }
        }
        return 0;
    }
}
