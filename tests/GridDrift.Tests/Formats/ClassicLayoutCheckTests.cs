using System.Buffers.Binary;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>
/// A classic header whose data offsets the netCDF library could not have written is refused
/// instead of read from the wrong bytes (NetCDF Classic Format Specification: each variable's
/// data at its begin offset, record slabs in turn within a record; netCDF-C aligns begins to 4
/// bytes): a begin moved by one byte, and two variables whose data overlap.
/// </summary>
public class ClassicLayoutCheckTests
{
    static (byte[] Bytes, long TimeBegin, long DataBegin) File1(TempFolder dir)
    {
        string path = SampleFiles.Record(dir.File("in.nc"), ClassicVariant.Cdf1, frames: 6, nlat: 3, nlon: 4);
        using var reader = ClassicReader.Open(path);
        long Begin(string name) => reader.LocateFrames(reader.RequireVariable(name), 0)!.Value.Offset;
        return (File.ReadAllBytes(path), Begin("time"), Begin("tcwv"));
    }

    /// <summary>Rewrites the one 32-bit big-endian begin field holding <paramref name="from"/> in the header.</summary>
    static byte[] WithBegin(byte[] bytes, long from, long to)
    {
        var copy = (byte[])bytes.Clone();
        Span<byte> pattern = stackalloc byte[4];
        BinaryPrimitives.WriteUInt32BigEndian(pattern, (uint)from);
        int at = copy.AsSpan(0, (int)Math.Min(copy.Length, 1024)).IndexOf(pattern);
        Assert.True(at > 0, "the begin field was not found in the header");
        BinaryPrimitives.WriteUInt32BigEndian(copy.AsSpan(at), (uint)to);
        return copy;
    }

    [Fact]
    public void A_begin_moved_by_one_byte_is_refused()
    {
        using var dir = new TempFolder();
        var (bytes, _, data) = File1(dir);
        File.WriteAllBytes(dir.File("moved.nc"), WithBegin(bytes, data, data + 1));
        var e = Assert.Throws<BadInputException>(() => DatasetFiles.Open(dir.File("moved.nc")).Dispose());
        Assert.Equal("tcwv", e.Variable);
        Assert.Contains("4-byte boundary", e.Message);
    }

    [Fact]
    public void Overlapping_data_are_refused()
    {
        using var dir = new TempFolder();
        var (bytes, time, data) = File1(dir);
        File.WriteAllBytes(dir.File("overlap.nc"), WithBegin(bytes, data, time));
        var e = Assert.Throws<BadInputException>(() => DatasetFiles.Open(dir.File("overlap.nc")).Dispose());
        Assert.Contains("overlap", e.Message);
    }

    [Fact]
    public void The_unchanged_file_opens()
    {
        using var dir = new TempFolder();
        var (bytes, _, _) = File1(dir);
        File.WriteAllBytes(dir.File("same.nc"), bytes);
        DatasetFiles.Open(dir.File("same.nc")).Dispose();
    }
}
