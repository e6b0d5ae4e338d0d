using System.Runtime.InteropServices;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// Blosc (version 1 frames, any inner compressor, byte or bit shuffle) through the C library
/// Debian ships as libblosc1, loaded when the first blosc chunk is met: there is no managed
/// decoder of blosclz. Without the library such a chunk is bad input naming the package.
/// </summary>
internal static unsafe class BloscLibrary
{
    static readonly Lazy<IntPtr> Handle = new(() =>
        NativeLibrary.TryLoad("libblosc.so.1", out var h) || NativeLibrary.TryLoad("libblosc.so", out h) || NativeLibrary.TryLoad("blosc", out h) ? h : IntPtr.Zero);

    static delegate* unmanaged<void*, void*, nuint, int, int> _decompress;
    static delegate* unmanaged<void*, nuint*, nuint*, nuint*, void> _sizes;

    public static bool Available => Handle.Value != IntPtr.Zero;

    public const string Missing = "blosc-compressed chunks need the blosc library (Debian package libblosc1)";

    static void Bind()
    {
        if (!Available) throw new InvalidDataException(Missing);
        if (_decompress != null) return;
        _decompress = (delegate* unmanaged<void*, void*, nuint, int, int>)NativeLibrary.GetExport(Handle.Value, "blosc_decompress_ctx");
        _sizes = (delegate* unmanaged<void*, nuint*, nuint*, nuint*, void>)NativeLibrary.GetExport(Handle.Value, "blosc_cbuffer_sizes");
    }

    /// <summary>The uncompressed size the frame's header declares, checked against the frame; <paramref name="where"/> names the chunk for messages.</summary>
    public static int DecodedSize(ReadOnlySpan<byte> frame, string where)
    {
        Bind();
        // the frame header: version, version of the inner format, flags, type size, then uncompressed, block and compressed sizes (32-bit little-endian)
        if (frame.Length < 16) throw new InvalidDataException($"{where}: a blosc frame of {frame.Length} bytes is shorter than its 16-byte header");
        nuint nbytes, cbytes, blocksize;
        fixed (byte* src = frame) _sizes(src, &nbytes, &cbytes, &blocksize);
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
            int n = _decompress(src, dst, (nuint)size, 1);
            if (n != size) throw new InvalidDataException($"{where}: blosc could not decode the chunk (code {n})");
        }
    }
}
