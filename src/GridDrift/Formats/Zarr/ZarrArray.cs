namespace GridDrift.Formats.Zarr;

/// <summary>
/// One array of a Zarr store, as its metadata declares it: shape, the regular chunk grid, the
/// element type and byte order, the fill value of chunks never written, how a chunk's key is
/// spelled and the codecs that encoded it. Row-major (C) order only.
/// </summary>
internal sealed class ZarrArray
{
    /// <summary>Key prefix in the store ("tb", "group/tb"); also the variable's name.</summary>
    public required string Path { get; init; }
    public required long[] Shape { get; init; }
    /// <summary>The chunk grid's cell: a whole chunk, or with sharding a whole shard.</summary>
    public required int[] ChunkShape { get; init; }
    public required ZarrDataType Type { get; init; }
    /// <summary>One element of the fill value, little-endian; zeros when the metadata gives none.</summary>
    public required byte[] Fill { get; init; }
    /// <summary>Bytes-to-bytes codecs in the order they were applied when writing (decoded in reverse).</summary>
    public required IReadOnlyList<IByteCodec> Codecs { get; init; }
    /// <summary>The spelling of a chunk's key from its grid position.</summary>
    public required Func<long[], string> ChunkKey { get; init; }
    public ShardLayout? Shards { get; init; }
    public IReadOnlyList<string?>? DimensionNames { get; init; }
    public required List<NcAttribute> Attributes { get; init; }
    /// <summary>Why the array cannot be read (an unsupported type, codec or order); null when it can.</summary>
    public string? Unreadable { get; init; }

    /// <summary>The unit read and cached: a chunk, or with sharding an inner chunk.</summary>
    public int[] UnitShape => Shards?.InnerShape ?? ChunkShape;

    public int UnitBytes => UnitShape.Aggregate(Type.Readable ? Type.Size : 1, (n, d) => checked(n * d));

    /// <summary>Key spelling of v2 stores under <paramref name="prefix"/> ("" or "tb/"): "0.1.2" (or with '/' when the array says so), "0" for a scalar.</summary>
    public static Func<long[], string> V2Keys(string prefix, char separator) =>
        index => prefix + (index.Length == 0 ? "0" : string.Join(separator, index));

    /// <summary>Key spelling of v3 stores: "default" is "c/0/1/2" (or "c.0.1.2"), "v2" is "0.1.2".</summary>
    public static Func<long[], string> V3Keys(string prefix, string encoding, char separator) => encoding == "v2"
        ? V2Keys(prefix, separator)
        : index => prefix + "c" + (index.Length == 0 ? "" : separator + string.Join(separator, index));
}

/// <summary>
/// Zarr v3's sharding_indexed codec: each stored object holds a shard of inner chunks, each
/// encoded on its own, and an index of (offset, length) pairs, unsigned 64-bit, one per inner
/// chunk in row-major order, both all ones for a chunk never written.
/// </summary>
internal sealed record ShardLayout(int[] InnerShape, IReadOnlyList<IByteCodec> InnerCodecs, bool InnerBigEndian, bool IndexAtEnd, bool IndexBigEndian, bool IndexChecksum)
{
    public int InnerCount(int[] shardShape)
    {
        int n = 1;
        for (int d = 0; d < shardShape.Length; d++) n = checked(n * (shardShape[d] / InnerShape[d]));
        return n;
    }

    public int IndexBytes(int[] shardShape) => checked(InnerCount(shardShape) * 16 + (IndexChecksum ? 4 : 0));
}
