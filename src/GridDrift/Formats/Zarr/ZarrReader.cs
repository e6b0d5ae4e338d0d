using System.Buffers.Binary;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// A Zarr store (v2 or v3) in the netCDF data model: arrays are variables, their attributes
/// (CF's included) are the variable's, dimensions come from xarray's _ARRAY_DIMENSIONS (v2) or
/// dimension_names (v3) and are shared by name (arrays without names get phony dimensions, one
/// per length), the root group's attributes are global. A hyperslab is read chunk by chunk:
/// chunks never written are the fill value, chunks are decoded once and shared through
/// <see cref="DecodedChunks"/>, and the chunks of one read are decoded in parallel.
/// </summary>
internal sealed class ZarrReader : IDatasetReader
{
    readonly IByteStore _store;
    readonly Dictionary<NcVariable, ZarrArray> _arrays = new(ReferenceEqualityComparer.Instance);

    public string Path { get; }
    public string Format { get; }
    public IReadOnlyList<NcDimension> Dimensions { get; }
    public IReadOnlyList<NcAttribute> Attributes { get; }
    public IReadOnlyList<NcVariable> Variables { get; }

    ZarrReader(string path, IByteStore store, ZarrMetadata metadata)
    {
        Path = path;
        _store = store;
        Format = $"Zarr v{metadata.Version}";
        Attributes = metadata.Attributes;
        var dims = new List<NcDimension>();
        var byName = new Dictionary<string, NcDimension>(StringComparer.Ordinal);
        var phony = new Dictionary<long, NcDimension>();
        var vars = new List<NcVariable>();
        foreach (var array in metadata.Arrays)
        {
            var vdims = new NcDimension[array.Shape.Length];
            for (int d = 0; d < vdims.Length; d++)
            {
                if (array.DimensionNames?[d] is { Length: > 0 } name)
                {
                    if (!byName.TryGetValue(name, out var dim))
                    {
                        dim = new NcDimension(name, array.Shape[d], false);
                        byName[name] = dim;
                        dims.Add(dim);
                    }
                    else if (dim.Length != array.Shape[d])
                        throw new BadInputException(path, array.Path, $"dimension '{name}' has length {array.Shape[d]} here and {dim.Length} in another array");
                    vdims[d] = dim;
                }
                else
                {
                    if (!phony.TryGetValue(array.Shape[d], out var p))
                    {
                        p = new NcDimension($"phony_dim_{phony.Count}", array.Shape[d], false);
                        phony[array.Shape[d]] = p;
                        dims.Add(p);
                    }
                    vdims[d] = p;
                }
            }
            var variable = array.Unreadable is null
                ? new NcVariable(array.Path, array.Type.Type, vdims, array.Attributes)
                : new NcVariable(array.Path, NcType.Unsupported, vdims, array.Attributes, array.Unreadable);
            vars.Add(variable);
            _arrays[variable] = array;
        }
        Dimensions = dims;
        Variables = vars;
    }

    public static ZarrReader Open(string path)
    {
        var store = new DirectoryStore(path);
        try
        {
            return new ZarrReader(path, store, ZarrMetadata.Read(store, System.IO.Path.GetFileNameWithoutExtension(System.IO.Path.TrimEndingDirectorySeparator(path))));
        }
        catch (Exception e) when (e is InvalidDataException or FormatException or OverflowException or InvalidOperationException or System.Text.Json.JsonException)
        {
            throw new BadInputException(path, null, $"not a readable Zarr store ({e.Message})", e);
        }
    }

    public string[] ReadStrings(NcVariable variable) =>
        throw new BadInputException(Path, variable.Name, "string arrays are not read from Zarr stores");

    public void ReadRaw(NcVariable variable, ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<byte> destination)
    {
        if (!_arrays.TryGetValue(variable, out var array)) throw new ArgumentException($"{variable.Name} is not a variable of {Path}");
        if (array.Unreadable is { } why) throw new BadInputException(Path, variable.Name, why);
        int size = array.Type.Size;
        var shape = array.Shape;
        Hyperslab.Validate(Path, variable, shape, start, count, destination.Length, size);
        if (destination.Length == 0) return;
        int rank = shape.Length;
        var unit = array.UnitShape;
        // the units (chunks, or inner chunks of shards) the hyperslab touches
        var first = new long[rank];
        var last = new long[rank];
        for (int d = 0; d < rank; d++)
        {
            first[d] = start[d] / unit[d];
            last[d] = (start[d] + count[d] - 1) / unit[d];
        }
        var units = new List<long[]>();
        var at = (long[])first.Clone();
        while (true)
        {
            units.Add((long[])at.Clone());
            int d = rank - 1;
            while (d >= 0 && at[d] == last[d]) { at[d] = first[d]; d--; }
            if (d < 0) break;
            at[d]++;
        }
        // a read of exactly one whole chunk (one-frame chunks, frame by frame): decoded straight into the destination, not cached
        bool wholeChunk = units.Count == 1 && array.Shards is null && destination.Length == array.UnitBytes;
        for (int d = 0; d < rank && wholeChunk; d++) wholeChunk = start[d] == units[0][d] * unit[d];
        if (wholeChunk)
        {
            try
            {
                if (!DecodeStored(array, array.ChunkKey(units[0]), destination)) FillUnit(array, destination);
                return;
            }
            catch (InvalidDataException e)
            {
                throw new BadInputException(Path, variable.Name, e.Message, e);
            }
        }
        var startCopy = start.ToArray();
        var countCopy = count.ToArray();
        try
        {
            unsafe
            {
                fixed (byte* target = destination)
                {
                    nint address = (nint)target;
                    int length = destination.Length;
                    void One(long[] u) => CopyUnit(array, u, startCopy, countCopy, new Span<byte>((void*)address, length));
                    if (units.Count == 1) One(units[0]);
                    else Parallel.ForEach(units, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, One);
                }
            }
        }
        catch (AggregateException e) when (e.InnerExceptions.All(x => x is InvalidDataException or BadInputException))
        {
            var inner = e.InnerExceptions[0];
            throw inner as BadInputException ?? new BadInputException(Path, variable.Name, inner.Message, inner);
        }
        catch (InvalidDataException e)
        {
            throw new BadInputException(Path, variable.Name, e.Message, e);
        }
    }

    /// <summary>Copies the part of unit <paramref name="u"/> inside the hyperslab into its place in the destination.</summary>
    void CopyUnit(ZarrArray array, long[] u, long[] start, long[] count, Span<byte> destination)
    {
        int rank = u.Length, size = array.Type.Size;
        var unit = array.UnitShape;
        using var lease = Unit(array, u, out var filled);
        var data = filled ?? lease.Bytes;
        // the overlap of the unit and the hyperslab, in array coordinates
        var lo = new long[rank];
        var hi = new long[rank];
        for (int d = 0; d < rank; d++)
        {
            lo[d] = Math.Max(start[d], u[d] * unit[d]);
            hi[d] = Math.Min(start[d] + count[d], (u[d] + 1) * unit[d]);
        }
        if (rank == 0)
        {
            data[..size].CopyTo(destination);
            return;
        }
        int run = checked((int)(hi[rank - 1] - lo[rank - 1]) * size);
        var at = (long[])lo.Clone();
        while (true)
        {
            long source = 0, target = 0;
            for (int d = 0; d < rank; d++)
            {
                source = source * unit[d] + (at[d] - u[d] * unit[d]);
                target = target * count[d] + (at[d] - start[d]);
            }
            data.Slice(checked((int)(source * size)), run).CopyTo(destination.Slice(checked((int)(target * size)), run));
            int k = rank - 2;
            while (k >= 0 && at[k] == hi[k] - 1) { at[k] = lo[k]; k--; }
            if (k < 0) break;
            at[k]++;
        }
    }

    /// <summary>
    /// Unit <paramref name="u"/> decoded: little-endian elements in row-major order over the whole
    /// unit shape, held by the lease, or in <paramref name="filled"/> for a unit never written. The
    /// next units along time are decoded ahead.
    /// </summary>
    DecodedChunks.Lease Unit(ZarrArray array, long[] u, out byte[]? filled)
    {
        filled = null;
        // this unit first, so that adding the next one cannot evict it
        var request = Request(array, u);
        var lease = request is { } held ? DecodedChunks.Get(held.Key, array.UnitBytes, held.Decode) : default;
        // the next units along time, one per core as far as the cache holds them, are decoded while the workers use this one
        int depth = Math.Max(1, Math.Min(Environment.ProcessorCount, (int)(DecodedChunks.Budget / Math.Max(1, array.UnitBytes)) - 1));
        for (int d = 1; d <= depth && u.Length > 0 && (u[0] + d) * array.UnitShape[0] < array.Shape[0]; d++)
        {
            var next = (long[])u.Clone();
            next[0] += d;
            if (Request(array, next) is { } ahead) DecodedChunks.Ahead(ahead.Key, array.UnitBytes, ahead.Decode);
        }
        if (request is null) filled = FillUnit(array, array.UnitBytes);
        return lease;
    }

    /// <summary>The cache key of a unit and how to decode it; null for a unit never written (the fill value).</summary>
    (string Key, Action<Span<byte>> Decode)? Request(ZarrArray array, long[] u)
    {
        int bytes = array.UnitBytes;
        if (array.Shards is not { } shards)
        {
            string key = array.ChunkKey(u);
            string? version = _store.Version(key);
            if (version is null) return null;
            return (_store.Location + "\n" + key + "\n" + version, chunk =>
            {
                if (!DecodeStored(array, key, chunk)) throw new InvalidDataException($"chunk '{key}' vanished while it was read");
            });
        }
        int rank = u.Length;
        var shard = new long[rank];
        int local = 0;
        for (int d = 0; d < rank; d++)
        {
            int ratio = array.ChunkShape[d] / shards.InnerShape[d];
            shard[d] = u[d] / ratio;
            local = local * ratio + (int)(u[d] % ratio);
        }
        string shardKey = array.ChunkKey(shard);
        string? shardVersion = _store.Version(shardKey);
        if (shardVersion is null) return null;
        var index = ShardIndex(array, shards, shardKey, shardVersion);
        ulong offset = index[2 * local], length = index[2 * local + 1];
        if (offset == ulong.MaxValue && length == ulong.MaxValue) return null;
        if (length > int.MaxValue || offset > long.MaxValue) throw new InvalidDataException($"shard '{shardKey}': inner chunk {local} has an impossible extent");
        string where = $"shard '{shardKey}', inner chunk {local}";
        return (_store.Location + "\n" + shardKey + "\n" + shardVersion + "\n" + local, chunk =>
        {
            var encoded = _store.ReadRange(shardKey, (long)offset, (int)length) ?? throw new InvalidDataException($"{where} vanished while it was read");
            Decode(encoded, shards.InnerCodecs, shards.InnerBigEndian && array.Type.Size > 1, array.Type.Size, chunk, where);
        });
    }

    ulong[] ShardIndex(ZarrArray array, ShardLayout shards, string key, string version)
    {
        int entries = shards.InnerCount(array.ChunkShape), indexBytes = shards.IndexBytes(array.ChunkShape);
        using var raw = DecodedChunks.Get(_store.Location + "\n" + key + "\n" + version + "\nindex", indexBytes, target =>
        {
            var encoded = _store.ReadRange(key, shards.IndexAtEnd ? -indexBytes : 0, indexBytes) ?? throw new InvalidDataException($"shard '{key}' vanished while it was read");
            if (shards.IndexChecksum)
            {
                uint stored = BinaryPrimitives.ReadUInt32LittleEndian(encoded.AsSpan(indexBytes - 4));
                if (Crc32c.Of(encoded.AsSpan(0, indexBytes - 4)) != stored) throw new InvalidDataException($"shard '{key}': the index's CRC-32C checksum does not match");
            }
            encoded.CopyTo(target);
        });
        var index = new ulong[2 * entries];
        for (int i = 0; i < index.Length; i++)
            index[i] = shards.IndexBigEndian ? BinaryPrimitives.ReadUInt64BigEndian(raw.Bytes[(8 * i)..]) : BinaryPrimitives.ReadUInt64LittleEndian(raw.Bytes[(8 * i)..]);
        return index;
    }

    /// <summary>Reads chunk <paramref name="key"/> into a pooled buffer and decodes it into <paramref name="target"/>; false when the store has no such chunk.</summary>
    bool DecodeStored(ZarrArray array, string key, Span<byte> target)
    {
        var stored = _store.Rent(key, out int length);
        if (stored is null) return false;
        try { Decode(stored.AsSpan(0, length), array.Codecs, array.Type.BigEndian, array.Type.Size, target, key); }
        finally { System.Buffers.ArrayPool<byte>.Shared.Return(stored); }
        return true;
    }

    /// <summary>Undoes the bytes-to-bytes codecs (the last applied first), the first written straight into <paramref name="target"/>, then the byte order.</summary>
    static void Decode(ReadOnlySpan<byte> stored, IReadOnlyList<IByteCodec> codecs, bool bigEndian, int size, Span<byte> target, string where)
    {
        if (codecs.Count == 0)
        {
            if (stored.Length != target.Length) throw new InvalidDataException($"{where} holds {stored.Length} bytes; its chunk shape needs {target.Length}");
            stored.CopyTo(target);
        }
        else
        {
            byte[]? staged = null;
            for (int c = codecs.Count - 1; c >= 1; c--)
            {
                staged = codecs[c].Decode(staged ?? stored, where);
                ChunkGarbage.HandedOut(staged.Length);
            }
            codecs[0].DecodeInto(staged is null ? stored : staged, target, where);
        }
        if (bigEndian) RawValues.SwapInPlace(target, size);
    }

    static byte[] FillUnit(ZarrArray array, int bytes)
    {
        var data = new byte[bytes];
        FillUnit(array, data);
        return data;
    }

    static void FillUnit(ZarrArray array, Span<byte> target)
    {
        if (!array.Fill.Any(b => b != 0))
        {
            target.Clear();
            return;
        }
        for (int i = 0; i < target.Length; i += array.Fill.Length) array.Fill.CopyTo(target[i..]);
    }

    public void Dispose() { }
}
