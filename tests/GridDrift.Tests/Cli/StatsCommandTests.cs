using GridDrift.Formats;
using GridDrift.Grids;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Cli;

/// <summary>
/// `griddrift stats … --regions global --regions bands:20 --out s.nc --table s.parquet` on the
/// invented samples of every grid kind (cf-samples/, made by cf-samples/make_samples.py).
/// </summary>
public class StatsCommandTests
{
    static string Sample(string name) => SharedData.Sample(name);

    [Theory]
    [InlineData("tcwv_synthetic_2031.nc", "tcwv", GridKind.RegularLatLon, 48)]
    [InlineData("tb_gaussian_2031.nc", "tb", GridKind.IrregularLatLon, 8)]
    [InlineData("q_curvilinear_360day.nc", "huss", GridKind.Curvilinear, 5)]
    [InlineData("tb_geostationary_2031.nc", "tb", GridKind.Geostationary, 6)]
    public void Stats_runs_on_every_grid_kind(string sample, string variable, GridKind kind, int frames)
    {
        using var dir = new TempFolder();
        string series = dir.File("s.nc"), table = dir.File("s.parquet");
        var outcome = CliRun.Run("stats", Sample(sample), "--var", variable, "--regions", "global", "--regions", "bands:20", "--out", series, "--table", table);
        Assert.True(outcome.ExitCode == 0, outcome.Stderr);
        Assert.Contains($"{frames} frames × 10 regions", outcome.Stderr);
        Assert.True(File.Exists(table));

        using var reader = DatasetFiles.Open(series);
        Assert.Equal(frames, reader.Dimensions.Single(d => d.Name == "time").Length);
        var mean = reader.ReadAllDoubles(reader.RequireVariable("mean"));
        var min = reader.ReadAllDoubles(reader.RequireVariable("min"));
        var max = reader.ReadAllDoubles(reader.RequireVariable("max"));
        for (int i = 0; i < mean.Length; i++)
            if (!double.IsNaN(mean[i])) Assert.InRange(mean[i], min[i], max[i]);
        Assert.False(double.IsNaN(mean[0]), "the global mean of the first frame is missing");

        using var input = DatasetFiles.Open(Sample(sample));
        var axes = GridDrift.Conventions.Coordinates.VariableAxes.Discover(input, input.RequireVariable(variable));
        Assert.Equal(kind, GridDrift.Grids.GridReader.Read(input, axes).Kind);
    }
}
