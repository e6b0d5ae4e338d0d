using System.Buffers.Binary;
using System.IO.Compression;

namespace GridDrift.Formats.Zarr;

/// <summary>A bytes-to-bytes stage of a Zarr chunk's encoding, decoded here.</summary>
internal interface IByteCodec
{
    string Name { get; }

    /// <summary>Decodes into <paramref name="target"/>, which is exactly the decoded size (the last stage: a chunk's elements).</summary>
    void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where);

    /// <summary>Decodes to a new array of whatever size the data has (a stage before the last).</summary>
    byte[] Decode(ReadOnlySpan<byte> encoded, string where);
}

/// <summary>
/// The compressors of Zarr v2 (numcodecs' ids) and v3 (codec names): zlib and gzip by the
/// runtime's own streams, zstd by the system's libzstd where there is one (else ZstdSharp),
/// numcodecs' lz4 (a 4-byte little-endian size, then an LZ4 block) by K4os.Compression.LZ4,
/// blosc by the C library, crc32c checked and removed. The last stage decodes straight into the
/// chunk's buffer or the caller's frame.
/// </summary>
internal static class ByteCodecs
{
    /// <summary>The codec of a Zarr v2 compressor id or v3 codec name; null when it is none of these.</summary>
    public static IByteCodec? Named(string name) => name switch
    {
        "zlib" or "numcodecs.zlib" => new Deflated("zlib", s => new ZLibStream(s, CompressionMode.Decompress)),
        "gzip" or "numcodecs.gzip" => new Deflated("gzip", s => new GZipStream(s, CompressionMode.Decompress)),
        "zstd" or "numcodecs.zstd" => new Zstd(),
        "lz4" or "numcodecs.lz4" => new Lz4(),
        "blosc" or "numcodecs.blosc" => new Blosc(),
        "crc32c" => new Checksum(),
        _ => null,
    };

    static string Size(long n) => n.ToString(System.Globalization.CultureInfo.InvariantCulture);

    sealed class Deflated(string name, Func<Stream, Stream> open) : IByteCodec
    {
        public string Name => name;

        public unsafe void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where)
        {
            fixed (byte* pinned = encoded)
            {
                using var input = new UnmanagedMemoryStream(pinned, encoded.Length);
                using var inflater = open(input);
                int done = 0, n;
                while (done < target.Length && (n = inflater.Read(target[done..])) > 0) done += n;
                if (done != target.Length || inflater.ReadByte() >= 0)
                    throw new InvalidDataException($"{where}: {name} data decodes to {(done == target.Length ? "more than " + Size(done) : Size(done))} bytes, not {target.Length}");
            }
        }

        public unsafe byte[] Decode(ReadOnlySpan<byte> encoded, string where)
        {
            fixed (byte* pinned = encoded)
            {
                using var input = new UnmanagedMemoryStream(pinned, encoded.Length);
                using var inflater = open(input);
                using var copy = new MemoryStream();
                inflater.CopyTo(copy);
                return copy.ToArray();
            }
        }
    }

    sealed class Zstd : IByteCodec
    {
        public string Name => "zstd";

        public void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where)
        {
            if (NativeZstd.DecodeInto(encoded, target, where)) return;
            using var decompressor = new ZstdSharp.Decompressor();
            int n = decompressor.Unwrap(encoded, target);
            if (n != target.Length) throw new InvalidDataException($"{where}: zstd data decodes to {n} bytes, not {target.Length}");
        }

        public byte[] Decode(ReadOnlySpan<byte> encoded, string where)
        {
            using var decompressor = new ZstdSharp.Decompressor();
            return decompressor.Unwrap(encoded).ToArray();
        }
    }

    sealed class Lz4 : IByteCodec
    {
        public string Name => "lz4";

        static int Declared(ReadOnlySpan<byte> encoded, string where)
        {
            if (encoded.Length < 4) throw new InvalidDataException($"{where}: an lz4 chunk of {encoded.Length} bytes has no size header");
            int size = BinaryPrimitives.ReadInt32LittleEndian(encoded);
            return size >= 0 ? size : throw new InvalidDataException($"{where}: the lz4 header says {size} bytes");
        }

        public void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where)
        {
            int size = Declared(encoded, where);
            if (size != target.Length) throw new InvalidDataException($"{where}: the lz4 header says {size} bytes, not {target.Length}");
            int n = K4os.Compression.LZ4.LZ4Codec.Decode(encoded[4..], target);
            if (n != size) throw new InvalidDataException($"{where}: lz4 data decodes to {n} bytes, not {size}");
        }

        public byte[] Decode(ReadOnlySpan<byte> encoded, string where)
        {
            var output = GC.AllocateUninitializedArray<byte>(Declared(encoded, where));
            DecodeInto(encoded, output, where);
            return output;
        }
    }

    sealed class Blosc : IByteCodec
    {
        public string Name => "blosc";

        public void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where) => BloscLibrary.DecodeInto(encoded, target, where);

        public byte[] Decode(ReadOnlySpan<byte> encoded, string where)
        {
            var output = GC.AllocateUninitializedArray<byte>(BloscLibrary.DecodedSize(encoded, where));
            BloscLibrary.DecodeInto(encoded, output, where);
            return output;
        }
    }

    sealed class Checksum : IByteCodec
    {
        public string Name => "crc32c";

        static ReadOnlySpan<byte> Body(ReadOnlySpan<byte> encoded, string where)
        {
            if (encoded.Length < 4) throw new InvalidDataException($"{where}: {encoded.Length} bytes cannot end in a 4-byte checksum");
            var body = encoded[..^4];
            uint stored = BinaryPrimitives.ReadUInt32LittleEndian(encoded[^4..]);
            if (Crc32c.Of(body) != stored) throw new InvalidDataException($"{where}: CRC-32C checksum does not match (the chunk is damaged)");
            return body;
        }

        public void DecodeInto(ReadOnlySpan<byte> encoded, Span<byte> target, string where)
        {
            var body = Body(encoded, where);
            if (body.Length != target.Length) throw new InvalidDataException($"{where} holds {body.Length} bytes; its chunk shape needs {target.Length}");
            body.CopyTo(target);
        }

        public byte[] Decode(ReadOnlySpan<byte> encoded, string where) => Body(encoded, where).ToArray();
    }
}
