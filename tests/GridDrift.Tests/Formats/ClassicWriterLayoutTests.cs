using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>The writer's choice of variant, by the limits of the NetCDF classic specification.</summary>
public class ClassicWriterLayoutTests
{
    [Fact]
    public void A_variable_over_the_CDF2_limit_makes_the_writer_choose_CDF5()
    {
        // CDF-2 stores a variable's size in 32 bits: netCDF-C allows at most 2^32 − 4 bytes per variable.
        using var dir = new TempFolder();
        using var w = ClassicWriter.Create(dir.File("big.nc"));
        var y = w.AddDimension("y", 40_000);
        var x = w.AddDimension("x", 30_000);
        w.AddVariable("field", NcType.Float, [y, x]); // 4.8e9 bytes
        w.EndDefinitions();
        Assert.Equal(ClassicVariant.Cdf5, w.Variant);
    }

    [Fact]
    public void A_variable_just_under_the_limit_stays_CDF2()
    {
        using var dir = new TempFolder();
        using var w = ClassicWriter.Create(dir.File("edge.nc"));
        var y = w.AddDimension("y", 1_073_741_823); // × 4 bytes = 2^32 − 4
        w.AddVariable("field", NcType.Float, [y]);
        w.EndDefinitions();
        Assert.Equal(ClassicVariant.Cdf2, w.Variant);
    }

    [Fact]
    public void An_uncommitted_writer_leaves_no_file_behind()
    {
        using var dir = new TempFolder();
        string path = dir.File("interrupted.nc");
        using (var w = ClassicWriter.Create(path))
        {
            var t = w.AddDimension("time", 0, unlimited: true);
            var v = w.AddVariable("v", NcType.Float, [t]);
            w.EndDefinitions();
            w.WriteRecord<float>(v, 0, [1f]);
            // no Commit: the run was interrupted
        }
        Assert.Empty(Directory.EnumerateFileSystemEntries(dir.Path));
    }

    [Fact]
    public void A_committed_file_appears_only_under_its_final_name()
    {
        using var dir = new TempFolder();
        string path = dir.File("done.nc");
        using (var w = ClassicWriter.Create(path))
        {
            var t = w.AddDimension("time", 0, unlimited: true);
            var v = w.AddVariable("v", NcType.Float, [t]);
            w.EndDefinitions();
            w.WriteRecord<float>(v, 0, [1f]);
            Assert.False(File.Exists(path));
            w.Commit();
        }
        Assert.Equal([path], Directory.EnumerateFileSystemEntries(dir.Path));
    }
}
