using System.Runtime.InteropServices;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// Blosc (version 1 frames, any inner compressor, byte or bit shuffle) through the C library
/// Debian ships as libblosc1, loaded when the first blosc chunk is met: there is no managed
/// decoder of blosclz. Without the library such a chunk is bad input naming the package.
/// </summary>
internal static unsafe partial class BloscLibrary
{
    const string Name = "griddrift-blosc";

    static readonly Lazy<bool> Loaded = new(() => NativeLibraries.TryBind(Name, ["libblosc.so.1", "libblosc.so", "blosc"], out _));

    [LibraryImport(Name)] private static partial int blosc_decompress_ctx(void* src, void* dest, nuint destsize, int numinternalthreads);
    [LibraryImport(Name)] private static partial void blosc_cbuffer_sizes(void* cbuffer, nuint* nbytes, nuint* cbytes, nuint* blocksize);

    public static bool Available => Loaded.Value;

    public const string Missing = "blosc-compressed chunks need the blosc library (Debian package libblosc1)";

    /// <summary>The uncompressed size the frame's header declares, checked against the frame; <paramref name="where"/> names the chunk for messages.</summary>
    public static int DecodedSize(ReadOnlySpan<byte> frame, string where)
    {
        if (!Available) throw new InvalidDataException(Missing);
        // the frame header: version, version of the inner format, flags, type size, then uncompressed, block and compressed sizes (32-bit little-endian)
        if (frame.Length < 16) throw new InvalidDataException($"{where}: a blosc frame of {frame.Length} bytes is shorter than its 16-byte header");
        nuint nbytes, cbytes, blocksize;
        fixed (byte* src = frame) blosc_cbuffer_sizes(src, &nbytes, &cbytes, &blocksize);
        if (cbytes > (nuint)frame.Length) throw new InvalidDataException($"{where}: the blosc header says {cbytes} compressed bytes; the chunk has {frame.Length}");
        if (nbytes > int.MaxValue) throw new InvalidDataException($"{where}: the blosc header says {nbytes} bytes uncompressed");
        return (int)nbytes;
    }

    /// <summary>Decodes one blosc frame into <paramref name="target"/>, which must be its declared size.</summary>
    public static void DecodeInto(ReadOnlySpan<byte> frame, Span<byte> target, string where)
    {
        int size = DecodedSize(frame, where);
        if (size != target.Length) throw new InvalidDataException($"{where}: blosc data decodes to {size} bytes, not {target.Length}");
        if (size == 0) return;
        fixed (byte* src = frame)
        fixed (byte* dst = target)
        {
            int n = blosc_decompress_ctx(src, dst, (nuint)size, 1);
            if (n != size) throw new InvalidDataException($"{where}: blosc could not decode the chunk (code {n})");
        }
    }
}
