using GridDrift.Formats.Grib;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>
/// GRIB indexes remembered between runs give back what building gives (the built index is
/// checked against python3-eccodes in GribInteropTests), and only while the file is unchanged; a
/// damaged remembered index (cut, garbled, one bit flipped) is built again. On the invented GRIB sample (cf-samples).
/// </summary>
public class GribIndexCacheTests
{
    [InteropFact(Needs.PythonEccodes)]
    public void A_remembered_index_equals_the_built_one_while_the_file_is_unchanged()
    {
        using var dir = new TempFolder();
        string grib = dir.File("record.grib2"), cache = dir.File("cache");
        File.Copy(SharedData.Sample("tcwv_synthetic_2031.grib2"), grib);

        var built = GribIndex.Build(grib);
        Assert.Null(GribIndexCache.Load(grib, cache));
        GribIndexCache.Store(grib, cache, built);
        Assert.Single(Directory.GetFiles(cache, "*.index"));
        var remembered = GribIndexCache.Load(grib, cache);
        Assert.NotNull(remembered);
        Assert.Equal(built.Messages, remembered.Messages); // records: every field
        Assert.Equal(built.Editions.Order(), remembered.Editions.Order());
        Assert.Equal(built.Grids.Keys.Order(), remembered.Grids.Keys.Order());
        foreach (var (key, grid) in built.Grids)
        {
            var again = remembered.Grids[key];
            Assert.Equal((grid.Kind, grid.Rows, grid.Columns, grid.ReverseColumns, grid.Unreadable), (again.Kind, again.Rows, again.Columns, again.ReverseColumns, again.Unreadable));
            Assert.Equal(grid.Latitudes, again.Latitudes);
            Assert.Equal(grid.Longitudes, again.Longitudes);
        }

        // the same bytes written again: a new write time (and change time), so the remembered index is not used
        File.WriteAllBytes(grib, File.ReadAllBytes(grib));
        File.SetLastWriteTimeUtc(grib, DateTime.UtcNow.AddMinutes(1));
        Assert.Null(GribIndexCache.Load(grib, cache));
    }

    [InteropFact(Needs.PythonEccodes)]
    public void A_damaged_remembered_index_is_not_used()
    {
        using var dir = new TempFolder();
        string grib = dir.File("record.grib2"), cache = dir.File("cache");
        File.Copy(SharedData.Sample("tcwv_synthetic_2031.grib2"), grib);
        GribIndexCache.Store(grib, cache, GribIndex.Build(grib));
        string stored = Directory.GetFiles(cache, "*.index").Single();
        var bytes = File.ReadAllBytes(stored);

        File.WriteAllBytes(stored, bytes[..(bytes.Length / 2)]); // cut short
        Assert.Null(GribIndexCache.Load(grib, cache));
        var garbled = (byte[])bytes.Clone();
        for (int k = bytes.Length / 3; k < bytes.Length; k += 7) garbled[k] ^= 0x5A;
        File.WriteAllBytes(stored, garbled);
        Assert.Null(GribIndexCache.Load(grib, cache));
        var flipped = (byte[])bytes.Clone();
        flipped[bytes.Length / 2] ^= 1; // one bit of one message's offset or level, say: still a readable layout
        File.WriteAllBytes(stored, flipped);
        Assert.Null(GribIndexCache.Load(grib, cache));
        File.WriteAllBytes(stored, bytes);
        Assert.NotNull(GribIndexCache.Load(grib, cache));
    }
}
