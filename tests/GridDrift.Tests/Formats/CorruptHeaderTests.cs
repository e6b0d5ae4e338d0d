using System.Buffers.Binary;
using System.Text;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Formats;

/// <summary>
/// A corrupt length field must never size an allocation. The headers below follow the CDF-5
/// grammar of the NetCDF/PnetCDF format specification, with absurd counts.
/// </summary>
public class CorruptHeaderTests
{
    static byte[] Cdf5Header(long dimLength, long attributeCount, long nameLength = 1)
    {
        var b = new List<byte>();
        void U32(uint v) { var x = new byte[4]; BinaryPrimitives.WriteUInt32BigEndian(x, v); b.AddRange(x); }
        void U64(ulong v) { var x = new byte[8]; BinaryPrimitives.WriteUInt64BigEndian(x, v); b.AddRange(x); }
        void Name(string s) { U64((ulong)nameLength); b.AddRange(Encoding.ASCII.GetBytes(s.PadRight((int)Math.Min(nameLength, 8))[..(int)Math.Min(nameLength, 8)])); while (b.Count % 4 != 0) b.Add(0); }
        b.AddRange("CDF"u8.ToArray()); b.Add(5);
        U64(0);                 // numrecs
        U32(0x0A); U64(1);      // one dimension
        Name("x"); U64((ulong)dimLength);
        if (attributeCount > 0) { U32(0x0C); U64((ulong)attributeCount); Name("a"); U32(5); U64(1); U32(0); }
        else { U32(0); U64(0); }
        U32(0x0B); U64(1);      // one variable
        Name("v"); U64(1); U64(0);
        U32(0); U64(0);         // no attributes
        U32(5); U64((ulong)dimLength * 4); U64(200);
        while (b.Count < 256) b.Add(0);
        return b.ToArray();
    }

    static void AssertRefusedWithoutLargeAllocation(byte[] file, string fault)
    {
        using var dir = new TempFolder();
        string path = dir.File("claims.nc");
        File.WriteAllBytes(path, file);
        long before = GC.GetAllocatedBytesForCurrentThread();
        var e = Assert.Throws<BadInputException>(() => DatasetFiles.Open(path).Dispose());
        long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Contains(fault, e.Message);
        Assert.True(allocated < 1 << 20, $"refusing the header allocated {allocated} bytes");
    }

    [Fact]
    public void A_variable_claiming_two_to_the_forty_elements_is_refused_before_any_buffer_is_made() =>
        AssertRefusedWithoutLargeAllocation(Cdf5Header(1L << 40, 0), "truncated");

    [Fact]
    public void An_attribute_list_claiming_two_to_the_forty_entries_is_refused() =>
        AssertRefusedWithoutLargeAllocation(Cdf5Header(4, 1L << 40), "more than the file could hold");

    [Fact]
    public void A_name_claiming_two_to_the_forty_bytes_is_refused() =>
        AssertRefusedWithoutLargeAllocation(Cdf5Header(4, 0, nameLength: 1L << 40), "exceeds the file");

    [Fact]
    public void The_same_header_with_sane_counts_opens()
    {
        // Control: the builder above makes a valid file when the counts are honest (a 4-element float at byte 200).
        using var dir = new TempFolder();
        string path = dir.File("ok.nc");
        File.WriteAllBytes(path, Cdf5Header(4, 0).Concat(new byte[16]).ToArray());
        using var reader = DatasetFiles.Open(path);
        Assert.Equal(ClassicVariant.Cdf5, ((ClassicReader)reader).Variant);
        Assert.Equal(new long[] { 4 }, reader.RequireVariable("v").Shape);
    }
}
