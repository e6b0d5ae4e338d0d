using System.Diagnostics;
using System.Globalization;
using GridDrift.Grids;
using GridDrift.Grids.Regridding;

namespace GridDrift.Benchmarks;

/// <summary>
/// Conservative remapping of 721 × 1440 frames (0.25°, centres on the poles) to 1°: the weight
/// build, and each frame after it, against a scipy sparse-matrix implementation (Kronecker product
/// of the 1-D overlaps, peers/scipy_regrid.py) in the same run.
/// </summary>
internal static class RegridBenchmark
{
    public static int Run(string[] args)
    {
        int frames = args.Length > 0 ? int.Parse(args[0], CultureInfo.InvariantCulture) : 50;
        const int Rows = 721, Columns = 1440;
        var lat = Enumerable.Range(0, Rows).Select(j => 90 - 0.25 * j).ToArray();
        var lon = Enumerable.Range(0, Columns).Select(i => 0.25 * i).ToArray();
        var source = RectilinearGrid.Build(lat, lon);
        var target = TargetGrids.TryParse("regular:1")!;
        var peer = Measure.Run("/usr/bin/python3", $"\"{Path.Combine(AppContext.BaseDirectory, "peers", "scipy_regrid.py")}\" {Rows} {Columns} 1 {frames}").Split(' ');
        double peerBuild = double.Parse(peer[0], CultureInfo.InvariantCulture), peerFrame = double.Parse(peer[1], CultureInfo.InvariantCulture);
        ConservativeRemap.Build(source, target); // warm up
        var clock = Stopwatch.StartNew();
        var weights = ConservativeRemap.Build(source, target);
        double build = clock.Elapsed.TotalSeconds;
        var rng = new Random(1);
        var x = Enumerable.Range(0, source.CellCount).Select(_ => (float)(240 + 20 * rng.NextDouble())).ToArray();
        var y = new float[target.CellCount];
        var f = new float[target.CellCount];
        for (int i = 0; i < 3; i++) weights.Apply(x, y, f);
        clock.Restart();
        for (int i = 0; i < frames; i++) weights.Apply(x, y, f);
        double perFrame = clock.Elapsed.TotalSeconds / frames;
        Console.WriteLine($"regrid benchmark: conservative 721 × 1440 → 1° ({weights.Column.Length} weights), 1 core");
        Console.WriteLine($"  weight build: GridDrift {build * 1000:0} ms, scipy {peerBuild * 1000:0} ms ({peerBuild / build:0.0}×)");
        Console.WriteLine($"  per frame:    GridDrift {perFrame * 1000:0.00} ms, scipy {peerFrame * 1000:0.00} ms ({peerFrame / perFrame:0.0}×)");
        return 0;
    }
}
