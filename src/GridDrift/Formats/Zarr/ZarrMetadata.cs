using System.Text;
using System.Text.Json.Nodes;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// A store's metadata: its Zarr version, the root group's attributes and every array, from the
/// consolidated metadata when the store has it (.zmetadata in v2, the root zarr.json's
/// consolidated_metadata in v3) and otherwise by walking the groups. Arrays in nested groups are
/// named by their path ("group/tb"), as netCDF-4 groups are.
/// </summary>
internal sealed record ZarrMetadata(int Version, List<NcAttribute> Attributes, List<ZarrArray> Arrays)
{
    const int MaxDepth = 16;

    /// <summary>Whether a folder is a Zarr store (v2 or v3) at its root.</summary>
    public static bool IsStore(string folder) =>
        new[] { "zarr.json", ".zgroup", ".zarray", ".zmetadata" }.Any(f => File.Exists(Path.Combine(folder, f)));

    public static ZarrMetadata Read(IByteStore store, string name)
    {
        if (Json(store, "zarr.json") is { } root) return V3(store, root, name);
        if (Json(store, ".zmetadata") is { } consolidated && consolidated["metadata"] is JsonObject documents)
            return V2(key => documents[key] as JsonObject, store, name);
        if (Json(store, ".zgroup") is null && Json(store, ".zarray") is null)
            throw new InvalidDataException("no zarr.json, .zgroup, .zarray or .zmetadata at the store's root");
        return V2(key => Json(store, key), store, name);
    }

    static JsonObject? Json(IByteStore store, string key)
    {
        var bytes = store.Read(key);
        if (bytes is null) return null;
        try { return JsonNode.Parse(Encoding.UTF8.GetString(bytes)) as JsonObject ?? throw new InvalidDataException($"'{key}' is not a JSON object"); }
        catch (System.Text.Json.JsonException e) { throw new InvalidDataException($"'{key}' is not valid JSON ({e.Message})", e); }
    }

    static ZarrMetadata V2(Func<string, JsonObject?> document, IByteStore store, string name)
    {
        var arrays = new List<ZarrArray>();
        if (document(".zarray") is { } single)
        {
            // the store is one array: it takes the store's name
            arrays.Add(V2Array(name, "", single, document(".zattrs")));
            return new ZarrMetadata(2, [], arrays);
        }
        var attributes = ZarrAttributes.From(document(".zattrs"), NcType.Double);
        WalkV2(document, store, "", arrays, 0);
        return new ZarrMetadata(2, attributes, arrays);
    }

    static void WalkV2(Func<string, JsonObject?> document, IByteStore store, string prefix, List<ZarrArray> arrays, int depth)
    {
        if (depth > MaxDepth) throw new InvalidDataException($"groups nested more than {MaxDepth} deep");
        foreach (var child in Children(document, store, prefix, ".zarray", ".zgroup"))
        {
            string path = prefix + child;
            if (document(path + "/.zarray") is { } array) arrays.Add(V2Array(path, path + "/", array, document(path + "/.zattrs")));
            else if (document(path + "/.zgroup") is not null) WalkV2(document, store, path + "/", arrays, depth + 1);
        }
    }

    /// <summary>The children of a group: the store's folders under it that hold an array's or a group's document (consolidated or stored).</summary>
    static IEnumerable<string> Children(Func<string, JsonObject?> document, IByteStore store, string prefix, params string[] markers) =>
        store.Folders(prefix.TrimEnd('/')).Where(c => markers.Any(m => document(prefix + c + "/" + m) is not null));

    static ZarrArray V2Array(string name, string keyPrefix, JsonObject meta, JsonObject? attributes)
    {
        var shape = Longs(meta["shape"], "shape");
        var chunks = Longs(meta["chunks"], "chunks").Select(c => checked((int)c)).ToArray();
        if (chunks.Length != shape.Length || chunks.Any(c => c <= 0)) throw new InvalidDataException($"array '{name}': chunks [{string.Join(", ", chunks)}] do not fit shape [{string.Join(", ", shape)}]");
        var type = meta["dtype"] is JsonValue dtype && dtype.TryGetValue<string>(out var spelled) ? ZarrDataType.FromV2(spelled) : new ZarrDataType(NcType.Unsupported, false, "structured");
        string? unreadable = type.Readable ? null : $"element type '{type.Declared}' is not supported";
        if ((string?)meta["order"] is "F") unreadable ??= "column-major (order 'F') chunks are not supported";
        if (meta["filters"] is JsonArray { Count: > 0 } filters)
            unreadable ??= $"filters ({string.Join(", ", filters.Select(f => (string?)f?["id"]))}) are not supported";
        var codecs = new List<IByteCodec>();
        if (meta["compressor"] is JsonObject compressor)
        {
            string id = (string?)compressor["id"] ?? "?";
            if (ByteCodecs.Named(id) is { } codec) codecs.Add(codec);
            else unreadable ??= $"compressor '{id}' is not supported (zlib, gzip, zstd, lz4 and blosc are)";
        }
        char separator = (string?)meta["dimension_separator"] == "/" ? '/' : '.';
        var fillNode = meta["fill_value"];
        var attrs = ZarrAttributes.From(attributes, type.Type, "_ARRAY_DIMENSIONS");
        byte[] fill = new byte[type.Readable ? type.Size : 1];
        if (type.Readable && fillNode is not null && ZarrAttributes.Number(fillNode) is { } fillValue)
        {
            fill = ZarrAttributes.Element(type.Type, fillValue);
            // xarray reads a v2 array's fill value as its _FillValue
            if (!attrs.Any(a => a.Name == "_FillValue")) attrs.Add(new NcAttribute("_FillValue", type.Type, ZarrAttributes.Typed(type.Type, [fillValue])));
        }
        unreadable ??= TooLarge(chunks, type);
        var names = attributes?["_ARRAY_DIMENSIONS"] is JsonArray dims ? dims.Select(d => (string?)d).ToList() : null;
        if (names is not null && names.Count != shape.Length) throw new InvalidDataException($"array '{name}': _ARRAY_DIMENSIONS names {names.Count} dimensions for a shape of {shape.Length}");
        return new ZarrArray
        {
            Path = name,
            Shape = shape,
            ChunkShape = chunks,
            Type = type,
            Fill = fill,
            Codecs = codecs,
            ChunkKey = ZarrArray.V2Keys(keyPrefix, separator),
            DimensionNames = names,
            Attributes = attrs,
            Unreadable = unreadable,
        };
    }

    static ZarrMetadata V3(IByteStore store, JsonObject root, string name)
    {
        var arrays = new List<ZarrArray>();
        string kind = (string?)root["node_type"] ?? throw new InvalidDataException("zarr.json has no node_type");
        if ((int?)root["zarr_format"] is not 3) throw new InvalidDataException($"zarr.json says zarr_format {root["zarr_format"]}, not 3");
        if (kind == "array")
        {
            arrays.Add(V3Array(name, "", root));
            return new ZarrMetadata(3, [], arrays);
        }
        var attributes = ZarrAttributes.From(root["attributes"] as JsonObject, NcType.Double);
        if (root["consolidated_metadata"]?["metadata"] is JsonObject consolidated)
        {
            foreach (var (path, node) in consolidated.OrderBy(e => e.Key, StringComparer.Ordinal))
                if (node is JsonObject meta && (string?)meta["node_type"] == "array") arrays.Add(V3Array(path, path + "/", meta));
        }
        else WalkV3(store, "", arrays, 0);
        return new ZarrMetadata(3, attributes, arrays);
    }

    static void WalkV3(IByteStore store, string prefix, List<ZarrArray> arrays, int depth)
    {
        if (depth > MaxDepth) throw new InvalidDataException($"groups nested more than {MaxDepth} deep");
        foreach (var child in store.Folders(prefix.TrimEnd('/')))
        {
            string path = prefix + child;
            if (Json(store, path + "/zarr.json") is not { } meta) continue;
            if ((string?)meta["node_type"] == "array") arrays.Add(V3Array(path, path + "/", meta));
            else WalkV3(store, path + "/", arrays, depth + 1);
        }
    }

    static ZarrArray V3Array(string name, string keyPrefix, JsonObject meta)
    {
        var shape = Longs(meta["shape"], "shape");
        var type = meta["data_type"] is JsonValue dt && dt.TryGetValue<string>(out var spelled) ? ZarrDataType.FromV3(spelled) : new ZarrDataType(NcType.Unsupported, false, meta["data_type"]?.ToJsonString() ?? "?");
        string? unreadable = type.Readable ? null : $"element type '{type.Declared}' is not supported";
        if ((string?)meta["chunk_grid"]?["name"] is not "regular") unreadable ??= $"chunk grid '{meta["chunk_grid"]?["name"]}' is not supported (regular is)";
        var chunks = meta["chunk_grid"]?["configuration"]?["chunk_shape"] is JsonArray cs ? cs.Select(c => checked((int)(long)c!)).ToArray() : shape.Select(s => (int)Math.Max(1, s)).ToArray();
        if (chunks.Length != shape.Length || chunks.Any(c => c <= 0)) throw new InvalidDataException($"array '{name}': chunk shape [{string.Join(", ", chunks)}] does not fit shape [{string.Join(", ", shape)}]");
        if (meta["storage_transformers"] is JsonArray { Count: > 0 }) unreadable ??= "storage transformers are not supported";
        string encoding = (string?)meta["chunk_key_encoding"]?["name"] ?? "default";
        char separator = (string?)meta["chunk_key_encoding"]?["configuration"]?["separator"] is { Length: 1 } sep ? sep[0] : encoding == "v2" ? '.' : '/';
        var pipeline = Pipeline(meta["codecs"] as JsonArray ?? [], chunks, name, ref unreadable);
        byte[] fill = new byte[type.Readable ? type.Size : 1];
        if (type.Readable && meta["fill_value"] is { } fillNode)
        {
            if (fillNode is JsonValue v && v.TryGetValue<string>(out var text) && ZarrAttributes.RawBits(text, type.Size) is { } bits) fill = bits;
            else if (ZarrAttributes.Number(fillNode) is { } number) fill = ZarrAttributes.Element(type.Type, number);
        }
        unreadable ??= TooLarge(pipeline.Shards?.InnerShape ?? chunks, type);
        var names = meta["dimension_names"] is JsonArray dims ? dims.Select(d => (string?)d).ToList() : null;
        if (names is not null && names.Count != shape.Length) throw new InvalidDataException($"array '{name}': dimension_names has {names.Count} names for a shape of {shape.Length}");
        return new ZarrArray
        {
            Path = name,
            Shape = shape,
            ChunkShape = chunks,
            Type = type with { BigEndian = pipeline.BigEndian && type.Readable && type.Size > 1 },
            Fill = fill,
            Codecs = pipeline.Codecs,
            Shards = pipeline.Shards,
            ChunkKey = ZarrArray.V3Keys(keyPrefix, encoding, separator),
            DimensionNames = names,
            Attributes = ZarrAttributes.From(meta["attributes"] as JsonObject, type.Type),
            Unreadable = unreadable,
        };
    }

    /// <summary>Why a chunk cannot be decoded at once: more than 2 GB (a buffer's limit); null when it can.</summary>
    static string? TooLarge(int[] unit, ZarrDataType type)
    {
        double bytes = unit.Aggregate((double)(type.Readable ? type.Size : 1), (n, d) => n * d);
        return bytes > int.MaxValue ? $"a chunk of [{string.Join(", ", unit)}] elements ({bytes:0} bytes) is more than one read can hold (2 GB)" : null;
    }

    sealed record V3Pipeline(bool BigEndian, List<IByteCodec> Codecs, ShardLayout? Shards);

    /// <summary>A v3 codec list: array-to-array codecs (only an identity transpose), one array-to-bytes codec (bytes or sharding), then bytes-to-bytes codecs.</summary>
    static V3Pipeline Pipeline(JsonArray codecs, int[] chunkShape, string name, ref string? unreadable, bool inner = false)
    {
        bool big = false;
        ShardLayout? shards = null;
        var bytesCodecs = new List<IByteCodec>();
        foreach (var codec in codecs)
        {
            string codecName = (string?)codec?["name"] ?? "?";
            var config = codec?["configuration"];
            switch (codecName)
            {
                case "bytes":
                case "endian":
                    big = (string?)config?["endian"] == "big";
                    break;
                case "transpose":
                    var order = config?["order"] as JsonArray;
                    if (order is null || order.Select((o, i) => (int?)o == i).Any(same => !same)) unreadable ??= "transposed chunks are not supported";
                    break;
                case "sharding_indexed":
                    if (inner) { unreadable ??= "nested sharding is not supported"; break; }
                    var innerShape = config?["chunk_shape"] is JsonArray ics ? ics.Select(c => checked((int)(long)c!)).ToArray() : [];
                    if (innerShape.Length != chunkShape.Length || innerShape.Where((c, d) => c <= 0 || chunkShape[d] % c != 0).Any())
                        throw new InvalidDataException($"array '{name}': inner chunks [{string.Join(", ", innerShape)}] do not divide shards [{string.Join(", ", chunkShape)}]");
                    var innerPipeline = Pipeline(config?["codecs"] as JsonArray ?? [], innerShape, name, ref unreadable, inner: true);
                    var index = config?["index_codecs"] as JsonArray ?? [];
                    bool indexBig = index.Any(c => (string?)c?["name"] is "bytes" or "endian" && (string?)c?["configuration"]?["endian"] == "big");
                    bool checksum = index.Any(c => (string?)c?["name"] == "crc32c");
                    if (index.Any(c => (string?)c?["name"] is not ("bytes" or "endian" or "crc32c"))) unreadable ??= "shard index codecs other than bytes and crc32c are not supported";
                    shards = new ShardLayout(innerShape, innerPipeline.Codecs, innerPipeline.BigEndian, (string?)config?["index_location"] != "start", indexBig, checksum);
                    break;
                default:
                    if (ByteCodecs.Named(codecName) is { } known) bytesCodecs.Add(known);
                    else unreadable ??= $"codec '{codecName}' is not supported (bytes, gzip, zlib, zstd, lz4, blosc, crc32c and sharding_indexed are)";
                    break;
            }
        }
        return new V3Pipeline(big, bytesCodecs, shards);
    }

    static long[] Longs(JsonNode? node, string what) =>
        node is JsonArray array ? array.Select(x => x is JsonValue v && v.TryGetValue<long>(out var n) && n >= 0 ? n : throw new InvalidDataException($"{what} holds '{x?.ToJsonString()}', not a length")).ToArray()
            : throw new InvalidDataException($"the metadata has no {what}");
}
