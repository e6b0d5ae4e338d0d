using GridDrift.Tests.Support;

namespace GridDrift.Tests.Workflows;

/// <summary>
/// R2: a record split over files may be named in any order. Every command that reads frames
/// gives, from the files named latest first, the same product as from the files in time order
/// (the order of a sorted glob); the parts are cut from one file by python netCDF4
/// (Interop/scripts/split_record.py). The latest-first order crashed stats, similarity, regrid,
/// anomalies with regions, derive, run and run --shard with "variable lat does not belong to …".
/// </summary>
public class FileOrderTests
{
    static string[] Split(TempFolder dir, string whole, string prefix, int parts)
    {
        ExternalTools.RunPython("split_record.py", whole, dir.File(prefix), parts.ToString(System.Globalization.CultureInfo.InvariantCulture));
        return Enumerable.Range(1, parts).Select(k => dir.File($"{prefix}_{k}.nc")).ToArray();
    }

    static void AssertSameProduct(string expected, string actual) => ProductComparison.AssertSameValues(expected, actual);

    [InteropTheory(Needs.PythonNetcdf)]
    [InlineData("stats", "--var tcwv --regions global bands:60")]
    [InlineData("similarity", "--var tcwv --regions global --range 0:100")]
    [InlineData("regrid", "--var tcwv --to regular:30")]
    [InlineData("climatology", "--var tcwv --by month")]
    [InlineData("anomalies", "--var tcwv --climatology CLIM --regions global bands:60")]
    public void Commands_give_the_same_product_whatever_the_order_of_the_files(string command, string options)
    {
        using var dir = new TempFolder();
        string whole = SampleFiles.Record(dir.File("whole.nc"), frames: 60, stepHours: 24, nlat: 12, nlon: 24);
        var parts = Split(dir, whole, "part", 3);
        Assert.Equal(0, CliRun.Run("climatology", whole, "--var", "tcwv", "--by", "month", "--out", dir.File("clim.nc"), "--quiet").ExitCode);
        var extra = options.Replace("CLIM", dir.File("clim.nc")).Split(' ');
        foreach (var (order, files) in new[] { ("sorted", parts), ("reversed", parts.Reverse().ToArray()) })
        {
            var outcome = CliRun.Run([command, .. files, .. extra, "--out", dir.File($"{order}.nc"), "--quiet"]);
            Assert.True(outcome.ExitCode == 0, $"{command}, files {order}: {outcome.Stderr}");
        }
        AssertSameProduct(dir.File("sorted.nc"), dir.File("reversed.nc"));
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Derive_takes_model_files_in_any_order()
    {
        using var dir = new TempFolder();
        ExternalTools.RunPython("column_water_reference.py", "make", dir.File("model.nc"));
        var parts = Split(dir, dir.File("model.nc"), "model", 2);
        foreach (var (order, files) in new[] { ("sorted", parts), ("reversed", parts.Reverse().ToArray()) })
        {
            var outcome = CliRun.Run(["derive", "column-water-vapour", .. files, "--surface-pressure", "ps", "--out", dir.File($"{order}.nc"), "--quiet"]);
            Assert.True(outcome.ExitCode == 0, $"derive, files {order}: {outcome.Stderr}");
        }
        AssertSameProduct(dir.File("sorted.nc"), dir.File("reversed.nc"));
    }

    [InteropFact(Needs.PythonNetcdf)]
    public void Recipes_and_shards_take_files_in_any_order()
    {
        using var dir = new TempFolder();
        string whole = SampleFiles.Record(dir.File("whole.nc"), frames: 60, stepHours: 24, nlat: 12, nlon: 24);
        Split(dir, whole, "part", 3);
        foreach (var (name, list) in new[] { ("sorted", "\"part_1.nc\", \"part_2.nc\", \"part_3.nc\""), ("reversed", "\"part_3.nc\", \"part_2.nc\", \"part_1.nc\"") })
            File.WriteAllText(dir.File(name + ".toml"), $"[input]\nfiles = [{list}]\nvariable = \"tcwv\"\nregions = [\"global\", \"bands:60\"]\nout = \"{name}\"\n\n[stats]\n\n[similarity]\nrange = \"0:100\"\n");
        foreach (var name in new[] { "sorted", "reversed" })
        {
            var run = CliRun.Run("run", dir.File(name + ".toml"), "--quiet");
            Assert.True(run.ExitCode == 0, $"run {name}: {run.Stderr}");
        }
        AssertSameProduct(dir.File("sorted/stats.nc"), dir.File("reversed/stats.nc"));
        AssertSameProduct(dir.File("sorted/similarity.nc"), dir.File("reversed/similarity.nc"));
        foreach (var shard in new[] { "1/2", "2/2" })
        {
            var run = CliRun.Run("run", dir.File("reversed.toml"), "--shard", shard, "--quiet");
            Assert.True(run.ExitCode == 0, $"run --shard {shard}: {run.Stderr}");
        }
    }
}
