using System.Runtime.InteropServices;
using GridDrift.Formats;
using GridDrift.Tests.Support;

namespace GridDrift.Tests.Interop;

/// <summary>
/// Zarr v3 stores written by zarrita (npm, a JavaScript Zarr v3 implementation) with each codec,
/// read by GridDrift and compared value for value with what zarrita reads back
/// (zarrita/zarr_v3_store.mjs): dimension_names, a chunk never written, big-endian integers with a
/// crc32c checksum under v2-spelled keys, shards of inner chunks with a checksummed index and
/// an inner chunk never written, and the same store described by inline consolidated metadata.
/// </summary>
public class ZarrV3InteropTests
{
    const int Times = 7, Rows = 25, Columns = 144, Cells = Times * Rows * Columns;

    [InteropTheory(Needs.NodeZarrita)]
    [InlineData("none")]
    [InlineData("gzip")]
    [InlineData("zlib")]
    [InlineData("zstd")]
    [InlineData("lz4")]
    [InlineData("blosc-lz4-shuffle")]
    [InlineData("blosc-zstd-bitshuffle")]
    [InlineData("blosc-blosclz-noshuffle")]
    public void Every_value_equals_what_zarrita_reads(string codec)
    {
        using var dir = new TempFolder();
        string store = dir.File("record.zarr"), witness = dir.File("witness.bin");
        ExternalTools.RunNode("zarr_v3_store.mjs", store, codec, witness);
        AssertReadsAsZarrita(store, witness);
    }

    /// <summary>
    /// A store whose arrays are described only in the root document's inline consolidated
    /// metadata (their own zarr.json removed after zarrita wrote and read them) reads the same.
    /// </summary>
    [InteropFact(Needs.NodeZarrita)]
    public void Arrays_described_only_by_consolidated_metadata_read_as_zarrita_reads_them()
    {
        using var dir = new TempFolder();
        string store = dir.File("record.zarr"), witness = dir.File("witness.bin");
        ExternalTools.RunNode("zarr_v3_store.mjs", store, "zstd", witness, "consolidated");
        Assert.False(File.Exists(Path.Combine(store, "tcwv", "zarr.json")));
        AssertReadsAsZarrita(store, witness);
    }

    static void AssertReadsAsZarrita(string store, string witness)
    {
        var expected = File.ReadAllBytes(witness).Chunk(8).Select(c => BitConverter.ToDouble(c)).ToArray();
        using var reader = DatasetFiles.Open(store);
        Assert.Equal("Zarr v3", reader.Format);
        Assert.Equal("CF-1.8", reader.Attributes.Text("Conventions"));
        var tcwv = reader.RequireVariable("tcwv");
        Assert.Equal(["time", "lat", "lon"], tcwv.Dimensions.Select(d => d.Name));
        Assert.True(float.IsNaN(((float[])tcwv.Attributes.Find("_FillValue")!.Values)[0])); // "NaN" in JSON, typed as the variable

        foreach (var (name, offset) in new[] { ("tcwv", 0), ("tcwv_shards", 2 * Cells) })
        {
            var values = new float[Cells];
            reader.ReadRaw(reader.RequireVariable(name), [0, 0, 0], [Times, Rows, Columns], MemoryMarshal.AsBytes(values.AsSpan()));
            for (int k = 0; k < Cells; k++) Assert.True(values[k].Equals((float)expected[offset + k]), $"{name} cell {k}: {values[k]} vs {expected[offset + k]}");
            Assert.Contains(values, float.IsNaN);
        }
        var part = new float[3 * 12 * 40];
        reader.ReadRaw(reader.RequireVariable("tcwv_shards"), [2, 8, 50], [3, 12, 40], MemoryMarshal.AsBytes(part.AsSpan()));
        for (int t = 0; t < 3; t++)
            for (int j = 0; j < 12; j++)
                for (int i = 0; i < 40; i++)
                    Assert.True(part[(t * 12 + j) * 40 + i].Equals((float)expected[2 * Cells + ((t + 2) * Rows + j + 8) * Columns + i + 50]), $"tcwv_shards[{t + 2}, {j + 8}, {i + 50}]");

        var q = reader.RequireVariable("q");
        Assert.Equal(NcType.Short, q.Type);
        var packed = new short[Cells];
        reader.ReadRaw(q, [0, 0, 0], [Times, Rows, Columns], MemoryMarshal.AsBytes(packed.AsSpan()));
        for (int k = 0; k < Cells; k++) Assert.True(packed[k] == expected[Cells + k], $"q cell {k}: {packed[k]} vs {expected[Cells + k]}");
    }
}
