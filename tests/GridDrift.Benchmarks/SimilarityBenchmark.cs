using System.Diagnostics;
using System.Globalization;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Pipeline;
using GridDrift.Operators.Similarity;
using GridDrift.Workflows;

namespace GridDrift.Benchmarks;

/// <summary>
/// SSIM maps of 721 × 1440 float32 frame pairs on one core and on both (two pairs at once),
/// against scikit-image's structural_similarity in the same run; VIF's term maps (the region
/// form) against a numpy/scipy implementation of the published whole-image VIF; and the peak memory of `similarity` over records of 100 and of 10,000
/// frames (each in its own process), which must not grow with the record.
/// </summary>
internal static class SimilarityBenchmark
{
    public static int Run(string[] args)
    {
        int pairs = args.Length > 0 ? int.Parse(args[0], CultureInfo.InvariantCulture) : 10;
        int rows = 721, columns = 1440;
        var rng = new Random(5);
        var a = Enumerable.Range(0, rows * columns).Select(_ => (float)(240 + 20 * Normal(rng))).ToArray();
        var b = a.Select(v => v + (float)Normal(rng)).ToArray();
        Console.WriteLine($"similarity benchmark: {rows} × {columns} float32 frame pairs, {Environment.ProcessorCount} cores");
        var peer = Measure.Run("/usr/bin/python3", $"\"{Path.Combine(AppContext.BaseDirectory, "peers", "skimage_ssim.py")}\" {Math.Max(2, pairs / 2)}").Split(' ');
        double skimage = double.Parse(peer[0], CultureInfo.InvariantCulture), numpyVif = double.Parse(peer[1], CultureInfo.InvariantCulture);
        Console.WriteLine($"  scikit-image structural_similarity: {skimage * 1000:0} ms/pair; numpy/scipy VIF: {numpyVif * 1000:0} ms/pair");

        foreach (int workers in new[] { 1, Environment.ProcessorCount })
        {
            var engines = Enumerable.Range(0, workers).Select(_ => new Ssim(rows, columns, true, 180, 320)).ToArray();
            var maps = Enumerable.Range(0, workers).Select(_ => new float[rows * columns]).ToArray();
            // warm up past the JIT's tiers (a real run maps thousands of pairs): the libraries' precompiled code is replaced only after a delay
            Parallel.For(0, workers, w => { for (var warm = Stopwatch.StartNew(); warm.Elapsed.TotalSeconds < 1.5;) engines[w].Map(a, b, maps[w]); });
            var clock = Stopwatch.StartNew();
            Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
            {
                for (int p = w; p < pairs; p += workers) engines[w].Map(a, b, maps[w]);
            });
            double perPair = clock.Elapsed.TotalSeconds / pairs;
            Console.WriteLine($"  GridDrift SSIM map, {workers} core(s): {perPair * 1000,6:0.0} ms/pair, {skimage / perPair,5:0.0}× scikit-image");
        }
        int vifPairs = Math.Max(2, pairs / 2);
        foreach (int workers in new[] { 1, Environment.ProcessorCount })
        {
            // the region form: the frame's term maps, which every region then sums (as `similarity --metric vif` runs it)
            var engines = Enumerable.Range(0, workers).Select(_ => new VifField(rows, columns, true, 180, 320)).ToArray();
            var nums = Enumerable.Range(0, workers).Select(_ => new float[rows * columns]).ToArray();
            var dens = Enumerable.Range(0, workers).Select(_ => new float[rows * columns]).ToArray();
            Parallel.For(0, workers, w => { for (var warm = Stopwatch.StartNew(); warm.Elapsed.TotalSeconds < 1.5;) engines[w].Terms(a, b, nums[w], dens[w]); });
            var clock = Stopwatch.StartNew();
            Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
            {
                for (int p = w; p < vifPairs; p += workers) engines[w].Terms(a, b, nums[w], dens[w]);
            });
            double perPair = clock.Elapsed.TotalSeconds / vifPairs;
            Console.WriteLine($"  GridDrift VIF term maps, {workers} core(s): {perPair * 1000,6:0.0} ms/pair, {numpyVif / perPair,5:0.0}× numpy/scipy");
        }

        if (args.Contains("--kernels")) return 0;
        string dir = Path.Combine(Path.GetTempPath(), "griddrift-bench");
        Directory.CreateDirectory(dir);
        string self = Environment.ProcessPath!;
        string selfArgs = self.EndsWith("dotnet") ? $"\"{typeof(SimilarityBenchmark).Assembly.Location}\" " : "";
        foreach (int frames in new[] { 100, 10_000 })
        {
            string path = Path.Combine(dir, $"sim_{frames}.nc");
            if (!File.Exists(path)) WriteRecord(path, frames, 90, 180);
            var result = Measure.Run(self, $"{selfArgs}similarity-one \"{path}\"").Split(' ');
            Console.WriteLine($"  similarity over {frames,6} frames of 90 × 180 (global, bands:20, tiles:20x20; ssim, corr, rmsd, mean-abs-change): {result[0]} s, peak {result[1]} MiB");
        }
        return 0;
    }

    public static int RunOne(string[] args)
    {
        string output = Path.Combine(Path.GetTempPath(), "griddrift-bench", "sim_out_" + Environment.ProcessId + ".nc");
        var clock = Stopwatch.StartNew();
        SimilarityStep.Run(new SimilarityOptions([args[0]], "tb", ["global", "bands:20", "tiles:20x20"],
            [SimilarityMetric.Ssim, SimilarityMetric.Corr, SimilarityMetric.Rmsd, SimilarityMetric.MeanAbsChange], output, Range: "180:320"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"{clock.Elapsed.TotalSeconds:0.0} {Measure.PeakResidentMiB():0}"));
        File.Delete(output);
        return 0;
    }

    static void WriteRecord(string path, int frames, int rows, int columns)
    {
        var rng = new Random(2);
        using var w = ClassicWriter.Create(path);
        var time = w.AddDimension("time", 0, unlimited: true);
        var lat = w.AddDimension("lat", rows);
        var lon = w.AddDimension("lon", columns);
        var vt = w.AddVariable("time", NcType.Double, [time], [NcAttribute.Text("units", "hours since 2031-01-01")]);
        var vlat = w.AddVariable("lat", NcType.Float, [lat], [NcAttribute.Text("units", "degrees_north")]);
        var vlon = w.AddVariable("lon", NcType.Float, [lon], [NcAttribute.Text("units", "degrees_east")]);
        var v = w.AddVariable("tb", NcType.Float, [time, lat, lon], [NcAttribute.Text("units", "K")]);
        w.EndDefinitions();
        w.Write<float>(vlat, Enumerable.Range(0, rows).Select(j => -89f + 2f * j).ToArray());
        w.Write<float>(vlon, Enumerable.Range(0, columns).Select(i => 1f + 2f * i).ToArray());
        var frame = new float[rows * columns];
        for (int t = 0; t < frames; t++)
        {
            for (int k = 0; k < frame.Length; k++) frame[k] = (float)(240 + 10 * Math.Sin(k * 0.01 + t * 0.1) + rng.NextDouble());
            w.WriteRecord<double>(vt, t, [3.0 * t]);
            w.WriteRecord<float>(v, t, frame);
        }
        w.Commit();
    }

    static double Normal(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
}
