using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// `griddrift similarity FILES --var V --regions global --regions bands:20 --metric
/// ssim,vif,corr,rmsd,mean-abs-change --out sim.nc --table sim.parquet` on the invented samples of
/// every grid kind; SSIM lies in [−1, 1] (Wang et al. 2004), correlations in [−1, 1], RMS
/// differences are not below mean absolute changes (the quadratic mean bounds the mean).
/// </summary>
public class SimilarityCommandTests
{
    [Theory]
    [InlineData("tcwv_synthetic_2031.nc", "tcwv", 47)]
    [InlineData("tb_gaussian_2031.nc", "tb", 7)]
    [InlineData("q_curvilinear_360day.nc", "huss", 4)]
    [InlineData("tb_geostationary_2031.nc", "tb", 5)]
    public void Similarity_runs_on_every_grid_kind(string sample, string variable, int pairs)
    {
        using var dir = new TempFolder();
        string series = dir.File("sim.nc"), table = dir.File("sim.parquet");
        var outcome = CliRun.Run("similarity", SharedData.Sample(sample), "--var", variable, "--regions", "global", "--regions", "bands:20",
            "--metric", "ssim,vif,corr,rmsd,mean-abs-change", "--out", series, "--table", table);
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        Assert.Contains($"{pairs} pairs × 10 regions", outcome.Stderr);
        using var reader = DatasetFiles.Open(series);
        var ssim = reader.ReadAllDoubles(reader.RequireVariable("ssim"));
        var corr = reader.ReadAllDoubles(reader.RequireVariable("corr"));
        var rmsd = reader.ReadAllDoubles(reader.RequireVariable("rmsd"));
        var mac = reader.ReadAllDoubles(reader.RequireVariable("mean_abs_change"));
        Assert.False(double.IsNaN(ssim[0]), "global SSIM of the first pair is missing");
        for (int i = 0; i < ssim.Length; i++)
        {
            if (!double.IsNaN(ssim[i])) Assert.InRange(ssim[i], -1, 1);
            if (!double.IsNaN(corr[i])) Assert.InRange(corr[i], -1, 1);
            if (!double.IsNaN(rmsd[i])) Assert.True(rmsd[i] >= mac[i] - 1e-12 * Math.Abs(mac[i]));
        }
        Assert.True(File.Exists(table));
    }

    [Fact]
    public void A_variable_without_a_data_range_is_refused_with_the_remedy()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), hours: [0, 3], nlat: 10, nlon: 20, variable: "x");
        var outcome = CliRun.Run("similarity", input, "--var", "x", "--regions", "global", "--out", dir.File("s.nc"));
        Assert.Equal(2, outcome.ExitCode);
        Assert.Contains("--range", Assert.Single(outcome.StderrLines));
    }
}
