using System.Buffers.Binary;
using System.IO.Compression;

namespace GridDrift.Formats.Zarr;

/// <summary>A bytes-to-bytes stage of a Zarr chunk's encoding, decoded here.</summary>
internal interface IByteCodec
{
    string Name { get; }

    /// <summary>The stage's input from its output; <paramref name="expected"/> is the decoded size when known, else −1.</summary>
    byte[] Decode(byte[] encoded, int expected, string where);
}

/// <summary>
/// The compressors of Zarr v2 (numcodecs' ids) and v3 (codec names): zlib and gzip by the
/// runtime's own streams, zstd by ZstdSharp, numcodecs' lz4 (a 4-byte little-endian size, then an
/// LZ4 block) by K4os.Compression.LZ4, blosc by the C library, crc32c checked and removed.
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

    sealed class Deflated(string name, Func<Stream, Stream> open) : IByteCodec
    {
        public string Name => name;

        public byte[] Decode(byte[] encoded, int expected, string where)
        {
            using var input = new MemoryStream(encoded, writable: false);
            using var inflater = open(input);
            if (expected >= 0)
            {
                var output = new byte[expected];
                int done = 0, n;
                while (done < expected && (n = inflater.Read(output, done, expected - done)) > 0) done += n;
                if (done != expected || inflater.ReadByte() >= 0)
                    throw new InvalidDataException($"{where}: {name} data decodes to {(done == expected ? "more than" : done.ToString(System.Globalization.CultureInfo.InvariantCulture))} bytes, not {expected}");
                return output;
            }
            using var copy = new MemoryStream();
            inflater.CopyTo(copy);
            return copy.ToArray();
        }
    }

    sealed class Zstd : IByteCodec
    {
        public string Name => "zstd";

        public byte[] Decode(byte[] encoded, int expected, string where)
        {
            using var decompressor = new ZstdSharp.Decompressor();
            if (expected >= 0)
            {
                var output = new byte[expected];
                int n = decompressor.Unwrap(encoded, output, 0);
                if (n != expected) throw new InvalidDataException($"{where}: zstd data decodes to {n} bytes, not {expected}");
                return output;
            }
            return decompressor.Unwrap(encoded).ToArray();
        }
    }

    sealed class Lz4 : IByteCodec
    {
        public string Name => "lz4";

        public byte[] Decode(byte[] encoded, int expected, string where)
        {
            if (encoded.Length < 4) throw new InvalidDataException($"{where}: an lz4 chunk of {encoded.Length} bytes has no size header");
            int size = BinaryPrimitives.ReadInt32LittleEndian(encoded);
            if (size < 0 || (expected >= 0 && size != expected)) throw new InvalidDataException($"{where}: the lz4 header says {size} bytes, not {expected}");
            var output = new byte[size];
            int n = K4os.Compression.LZ4.LZ4Codec.Decode(encoded, 4, encoded.Length - 4, output, 0, size);
            if (n != size) throw new InvalidDataException($"{where}: lz4 data decodes to {n} bytes, not {size}");
            return output;
        }
    }

    sealed class Blosc : IByteCodec
    {
        public string Name => "blosc";

        public byte[] Decode(byte[] encoded, int expected, string where)
        {
            var output = BloscLibrary.Decode(encoded, where);
            if (expected >= 0 && output.Length != expected) throw new InvalidDataException($"{where}: blosc data decodes to {output.Length} bytes, not {expected}");
            return output;
        }
    }

    sealed class Checksum : IByteCodec
    {
        public string Name => "crc32c";

        public byte[] Decode(byte[] encoded, int expected, string where)
        {
            if (encoded.Length < 4) throw new InvalidDataException($"{where}: {encoded.Length} bytes cannot end in a 4-byte checksum");
            var body = encoded.AsSpan(0, encoded.Length - 4);
            uint stored = BinaryPrimitives.ReadUInt32LittleEndian(encoded.AsSpan(encoded.Length - 4));
            if (Crc32c.Of(body) != stored) throw new InvalidDataException($"{where}: CRC-32C checksum does not match (the chunk is damaged)");
            return body.ToArray();
        }
    }
}
