using GridDrift.Tests.Support;

namespace GridDrift.Tests.Outputs;

/// <summary>
/// Global attributes that are numbers are written as numbers (CDL: no quotes, as netCDF-C's ncdump
/// prints numeric attributes): earth_radius_m and min_valid of a series, lag of a similarity series,
/// climatology_frames of a climatology; a sharded climatology still gathers.
/// </summary>
public class NumericAttributeTests
{
    [InteropFact(Needs.Ncdump)]
    public void Numeric_global_attributes_are_numbers()
    {
        using var dir = new TempFolder();
        string input = SampleFiles.Record(dir.File("in.nc"), frames: 40, stepHours: 24);
        Assert.Equal(0, CliRun.Run("stats", input, "--var", "tcwv", "--regions", "global", "--out", dir.File("s.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("similarity", input, "--var", "tcwv", "--regions", "global", "--range", "0:100", "--out", dir.File("sim.nc"), "--quiet").ExitCode);
        Assert.Equal(0, CliRun.Run("climatology", input, "--var", "tcwv", "--by", "month", "--out", dir.File("clim.nc"), "--quiet").ExitCode);
        string Header(string f) => ExternalTools.Run("ncdump", $"-h \"{dir.File(f)}\"").Stdout;
        Assert.Matches(@"\t\t:earth_radius_m = 6371008\.8 ;", Header("s.nc"));
        Assert.Matches(@"\t\t:min_valid = 0\.5 ;", Header("s.nc"));
        Assert.Matches(@"\t\t:lag = 1 ;", Header("sim.nc"));
        Assert.Matches(@"\t\t:climatology_frames = 40 ;", Header("clim.nc"));
        // the mask's fractions are float64, so a thin sliver of a cell keeps its digits
        Assert.Equal(0, CliRun.Run("regions", "--grid", input, "--regions", "box:b=-10,10,5,17", "--out", dir.File("mask.nc"), "--quiet").ExitCode);
        Assert.Contains("\tdouble cell_fraction(", Header("mask.nc"));

        File.WriteAllText(dir.File("recipe.toml"), "[input]\nfiles = [\"in.nc\"]\nvariable = \"tcwv\"\nout = \"products\"\n\n[climatology]\nby = \"month\"\n");
        foreach (var shard in new[] { "1/2", "2/2" }) Assert.Equal(0, CliRun.Run("run", dir.File("recipe.toml"), "--shard", shard, "--quiet").ExitCode);
        var gather = CliRun.Run("gather", dir.File("products/shards/shard-01-of-02"), dir.File("products/shards/shard-02-of-02"), "--quiet");
        Assert.True(gather.ExitCode == 0, gather.Stderr);
        Assert.Matches(@"\t\t:climatology_frames = 40 ;", Header("products/climatology.nc"));
    }
}
