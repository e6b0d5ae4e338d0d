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

    /// <summary>
    /// The record dimension's length field (0 for "unlimited" in the classic header) overwritten with
    /// a fixed length from 1 to 8: the record variables become fixed variables at their old begins.
    /// Two seeds: GridDrift's writer (coordinate variables defined after time) and ncgen (record
    /// variables only). python netCDF4 (netCDF-C) is the witness: GridDrift refuses a file exactly
    /// when it does (data out of definition order, overlapping, beyond the end), and otherwise reads
    /// the same shape and values.
    /// </summary>
    [InteropFact(Needs.PythonNetcdf | Needs.Ncgen)]
    public void A_record_dimension_turned_fixed_is_read_or_refused_as_netCDF_C_does()
    {
        using var dir = new TempFolder();
        var seeds = new[]
        {
            File1(dir).Bytes,
            File.ReadAllBytes(ExternalTools.RunNcgen(
                "netcdf seed {\ndimensions:\n time = UNLIMITED ;\n lat = 3 ;\n lon = 4 ;\nvariables:\n double time(time) ;\n float tcwv(time, lat, lon) ;\ndata:\n time = 0, 1, 2, 3, 4, 5 ;\n tcwv = "
                + string.Join(", ", Enumerable.Range(0, 72)) + " ;\n}\n", "classic", dir.File("ncgen.nc"))),
        };
        var paths = new List<string>();
        foreach (var (bytes, seed) in seeds.Select((b, i) => (b, i)))
        {
            int at = bytes.AsSpan(0, 256).IndexOf("time"u8) + 4;
            Assert.Equal(0u, BinaryPrimitives.ReadUInt32BigEndian(bytes.AsSpan(at)));
            for (uint length = 1; length <= 8; length++)
            {
                var copy = (byte[])bytes.Clone();
                BinaryPrimitives.WriteUInt32BigEndian(copy.AsSpan(at), length);
                paths.Add(dir.File($"seed{seed}_fixed{length}.nc"));
                File.WriteAllBytes(paths[^1], copy);
            }
        }
        var witness = NetcdfWitness.Digests(dir.File("list.txt"), paths);
        int read = 0;
        foreach (var path in paths)
        {
            IDatasetReader? reader = null;
            try { reader = DatasetFiles.Open(path); } catch (BadInputException) { }
            using (reader)
            {
                Assert.True(NetcdfWitness.Refuses(witness[path]) == (reader is null), $"{Path.GetFileName(path)}: netCDF-C refuses {NetcdfWitness.Refuses(witness[path])}, GridDrift {reader is null}");
                if (reader is null) continue;
                read++;
                var expected = witness[path].GetProperty("variables").GetProperty("tcwv");
                var v = reader.RequireVariable("tcwv");
                Assert.Equal(expected.GetProperty("shape").EnumerateArray().Select(e => e.GetInt64()), v.Shape);
                Assert.Equal(expected.GetProperty("sum").GetDouble(), reader.ReadAllDoubles(v).Where(double.IsFinite).Sum(), 6);
            }
        }
        Assert.InRange(read, 1, paths.Count - 1); // both outcomes occur
    }

    /// <summary>
    /// Names in a classic header are UTF-8 (NetCDF Classic Format Specification); 0xFF never occurs
    /// in UTF-8 (RFC 3629 §1). A variable name and an attribute name with that byte are refused, as
    /// python netCDF4 refuses both files (the witness).
    /// </summary>
    [InteropFact(Needs.PythonNetcdf)]
    public void A_name_that_is_not_UTF8_is_refused_as_netCDF4_refuses_it()
    {
        using var dir = new TempFolder();
        var (bytes, _, _) = File1(dir);
        var paths = new List<string>();
        foreach (var name in new[] { "tcwv"u8.ToArray(), "units"u8.ToArray() })
        {
            var copy = (byte[])bytes.Clone();
            int at = copy.AsSpan(0, 1024).IndexOf(name);
            copy[at + 1] = 0xFF;
            paths.Add(dir.File($"bad_{System.Text.Encoding.ASCII.GetString(name)}.nc"));
            File.WriteAllBytes(paths[^1], copy);
        }
        var witness = NetcdfWitness.Digests(dir.File("list.txt"), paths);
        foreach (var path in paths)
        {
            Assert.True(NetcdfWitness.Refuses(witness[path]), $"python netCDF4 reads {path}");
            var e = Assert.Throws<BadInputException>(() => DatasetFiles.Open(path).Dispose());
            Assert.Contains("is not valid UTF-8", e.Message);
        }
    }
}
