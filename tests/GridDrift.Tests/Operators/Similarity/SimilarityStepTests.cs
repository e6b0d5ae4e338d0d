using System.Text.Json;
using GridDrift.Formats;
using GridDrift.Pipeline;
using GridDrift.Operators.Similarity;
using GridDrift.Tests.Support;
using GridDrift.Workflows;

namespace GridDrift.Tests.Operators.Similarity;

/// <summary>
/// The similarity step end to end: region scores as the area-weighted mean of scikit-image's full
/// SSIM map (the same weighting applied to the reference map), area-weighted correlation, RMS
/// difference and mean absolute change against numpy; pairs, gaps, lags, time bounds and the
/// fixed-reference mode against the invented record's known construction.
/// </summary>
public class SimilarityStepTests
{
    static readonly SimilarityMetric[] Four = [SimilarityMetric.Ssim, SimilarityMetric.Corr, SimilarityMetric.Rmsd, SimilarityMetric.MeanAbsChange];

    [InteropFact(Needs.PythonScipy | Needs.PythonNetcdf)]
    public void Region_scores_equal_the_area_weighted_reference_map_and_numpy()
    {
        using var dir = new TempFolder();
        string input = dir.File("record.nc");
        ExternalTools.RunPython("make_similarity_fixture.py", input);
        string output = dir.File("sim.nc");
        // limited-area grid: every edge reflects, as scikit-image's filters do
        SimilarityStep.Run(new SimilarityOptions([input], "tb", ["global", "box:box=25.2,38.7,110.4,131.1"], Four, output, Range: "180:320"));
        var reference = JsonDocument.Parse(ExternalTools.RunPython("similarity_reference.py", input, "tb", "140", "25.2", "38.7", "110.4", "131.1")).RootElement;

        using var series = DatasetFiles.Open(output);
        var names = series.ReadText(series.RequireVariable("region_name"));
        Assert.Equal(["global", "box"], names);
        foreach (var metric in new[] { "ssim", "corr", "rmsd", "mean_abs_change" })
        {
            var ours = series.ReadAllDoubles(series.RequireVariable(metric));
            for (int r = 0; r < 2; r++)
            {
                var expected = reference.GetProperty(names[r]).GetProperty(metric).EnumerateArray().Select(e => e.GetDouble()).ToArray();
                Assert.Equal(3, expected.Length);
                for (int t = 0; t < 3; t++)
                {
                    double tolerance = metric == "ssim" ? 1e-5 : 1e-9 * Math.Abs(expected[t]);
                    Assert.True(Math.Abs(ours[t * 2 + r] - expected[t]) <= tolerance, $"{metric} of {names[r]} at pair {t}: {ours[t * 2 + r]} vs {expected[t]}");
                }
            }
        }
    }

    [Fact]
    public void Pairs_are_stamped_with_the_later_time_and_skip_gaps_unless_asked()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("gappy.nc"), hours: [0, 3, 6, 12, 15], nlat: 19, nlon: 36);
        string output = dir.File("sim.nc");
        var summary = SimilarityStep.Run(new SimilarityOptions([input], "tcwv", ["global"], Four, output, Range: "0:100"));
        Assert.Equal(3, summary.Pairs);
        var skipped = Assert.Single(summary.Skipped);
        Assert.Equal(("2031-01-01T06:00:00", "2031-01-01T12:00:00"), (skipped.Earlier.ToIsoString(), skipped.Later.ToIsoString()));
        using (var series = DatasetFiles.Open(output))
        {
            Assert.Equal([3.0, 6, 15], series.ReadAllDoubles(series.RequireVariable("time")));
            Assert.Equal([0.0, 3, 3, 6, 12, 15], series.ReadAllDoubles(series.RequireVariable("time_bnds")));
            Assert.Equal("time_bnds", series.RequireVariable("time").Attributes.Text("bounds"));
        }
        var across = SimilarityStep.Run(new SimilarityOptions([input], "tcwv", ["global"], Four, dir.File("across.nc"), Range: "0:100", AcrossGaps: true));
        Assert.Equal(4, across.Pairs);
        var lag2 = SimilarityStep.Run(new SimilarityOptions([input], "tcwv", ["global"], Four, dir.File("lag2.nc"), Range: "0:100", Lag: 2));
        Assert.Equal(1, lag2.Pairs); // (0, 6) only: (3, 12) and (6, 15) are 9 h apart, not 2 × 3 h
    }

    [Fact]
    public void A_frame_against_itself_as_the_fixed_reference_scores_one_and_zero()
    {
        // SSIM(x, x) = 1 (Wang et al. 2004); RMS difference and mean absolute change of x against x are 0.
        using var dir = new TempFolder();
        string record = SampleFiles.Record(dir.File("record.nc"), hours: [0, 3], nlat: 19, nlon: 36);
        string single = SampleFiles.Record(dir.File("first.nc"), hours: [0], nlat: 19, nlon: 36);
        string output = dir.File("sim.nc");
        SimilarityStep.Run(new SimilarityOptions([record], "tcwv", ["global", "bands:60"], Four, output, Range: "0:100", Against: single));
        using var series = DatasetFiles.Open(output);
        var ssim = series.ReadAllDoubles(series.RequireVariable("ssim"));
        var rmsd = series.ReadAllDoubles(series.RequireVariable("rmsd"));
        Assert.Equal(8, ssim.Length); // 2 frames × 4 regions
        Assert.All(ssim.Take(4), v => Assert.Equal(1.0, v));
        Assert.All(rmsd.Take(4), v => Assert.Equal(0.0, v));
        Assert.All(rmsd.Skip(4), v => Assert.Equal(3.0, v, 5)); // the second frame is the first plus 3 everywhere (SampleFiles)
        Assert.Null(series.FindVariable("time_bnds"));
    }

    [Fact]
    public void On_a_global_grid_the_SSIM_map_turns_with_the_longitudes()
    {
        // Periodic windows along a global longitude circle: rolling both frames by k columns rolls the map by k.
        int rows = 30, columns = 72, k = 17;
        var rng = new Random(4);
        var a = Enumerable.Range(0, rows * columns).Select(_ => (float)(240 + 20 * rng.NextDouble())).ToArray();
        var b = a.Select(v => v + (float)(3 * rng.NextDouble())).ToArray();
        float[] Roll(float[] f) => Enumerable.Range(0, rows * columns).Select(i => f[(i / columns) * columns + ((i % columns) + columns - k) % columns]).ToArray();
        var ssim = new Ssim(rows, columns, periodicX: true, 180, 320);
        var map = new float[rows * columns];
        var rolledMap = new float[rows * columns];
        ssim.Map(a, b, map);
        ssim.Map(Roll(a), Roll(b), rolledMap);
        Assert.Equal(Roll(map), rolledMap);
    }
}
