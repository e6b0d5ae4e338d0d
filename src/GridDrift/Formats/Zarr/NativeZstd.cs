using System.Runtime.InteropServices;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// zstd through the C library where the system has it (libzstd1 is on every Debian system): it
/// decodes about twice as fast as the managed port, which stays the fallback.
/// </summary>
internal static unsafe class NativeZstd
{
    static readonly Lazy<IntPtr> Library = new(() => NativeLibrary.TryLoad("libzstd.so.1", out var h) || NativeLibrary.TryLoad("libzstd.so", out h) ? h : IntPtr.Zero);
    static delegate* unmanaged<void*, nuint, void*, nuint, nuint> _decompress;
    static delegate* unmanaged<nuint, uint> _isError;

    /// <summary>Decodes into <paramref name="target"/>; false when the library is missing (the caller then decodes in managed code).</summary>
    public static bool DecodeInto(ReadOnlySpan<byte> frame, Span<byte> target, string where)
    {
        if (Library.Value == IntPtr.Zero) return false;
        if (_decompress == null)
        {
            _isError = (delegate* unmanaged<nuint, uint>)NativeLibrary.GetExport(Library.Value, "ZSTD_isError");
            _decompress = (delegate* unmanaged<void*, nuint, void*, nuint, nuint>)NativeLibrary.GetExport(Library.Value, "ZSTD_decompress");
        }
        fixed (byte* src = frame)
        fixed (byte* dst = target)
        {
            nuint n = _decompress(dst, (nuint)target.Length, src, (nuint)frame.Length);
            if (_isError(n) != 0 || n != (nuint)target.Length) throw new InvalidDataException($"{where}: zstd data does not decode to {target.Length} bytes");
        }
        return true;
    }
}
