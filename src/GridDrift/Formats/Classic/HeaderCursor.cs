using System.Buffers.Binary;
using System.Text;
using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats.Classic;

/// <summary>
/// Reads a classic header front to back, fetching bytes on demand. Every length read from the
/// file is checked against the bytes the file actually has before anything is allocated, so a
/// corrupt count can never size a buffer.
/// </summary>
internal sealed class HeaderCursor
{
    readonly SafeFileHandle _handle;
    readonly string _path;
    readonly long _fileLength;
    byte[] _buffer = new byte[8192];
    int _filled;
    int _position;

    public HeaderCursor(SafeFileHandle handle, string path, long fileLength)
    {
        _handle = handle;
        _path = path;
        _fileLength = fileLength;
    }

    public long Position => _position;
    public long Remaining => _fileLength - _position;

    void Ensure(long bytes)
    {
        if (bytes < 0 || _position + bytes > _fileLength)
            throw Fault($"header is cut short at byte {_position} (needs {bytes} more, the file has {_fileLength - _position})");
        long needed = _position + bytes;
        if (needed <= _filled) return;
        if (needed > int.MaxValue) throw Fault("header larger than 2 GiB");
        if (needed > _buffer.Length)
        {
            long size = Math.Max(needed, Math.Min((long)_buffer.Length * 2, _fileLength));
            Array.Resize(ref _buffer, (int)Math.Min(size, int.MaxValue));
        }
        int want = (int)Math.Min(_buffer.Length, _fileLength) - _filled;
        while (_filled < needed)
        {
            int got = RandomAccess.Read(_handle, _buffer.AsSpan(_filled, want), _filled);
            if (got <= 0) throw Fault($"file ended while reading the header at byte {_filled}");
            _filled += got;
            want -= got;
        }
    }

    public BadInputException Fault(string message) => new(_path, null, message);

    public ReadOnlySpan<byte> Bytes(long count)
    {
        Ensure(count);
        var span = _buffer.AsSpan(_position, (int)count);
        _position += (int)count;
        return span;
    }

    public uint UInt32() => BinaryPrimitives.ReadUInt32BigEndian(Bytes(4));
    public ulong UInt64() => BinaryPrimitives.ReadUInt64BigEndian(Bytes(8));

    /// <summary>A NON_NEG count of the given width; refused if it does not fit a long.</summary>
    public long Count(int width, string what)
    {
        ulong value = width == 8 ? UInt64() : UInt32();
        if (value > long.MaxValue) throw Fault($"{what} {value} is out of range");
        return (long)value;
    }

    public void SkipPadding(long unpadded)
    {
        long pad = ClassicLayout.Pad4(unpadded) - unpadded;
        if (pad > 0) Bytes(pad);
    }

    static readonly UTF8Encoding StrictUtf8 = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    public string Name(int countWidth, string what)
    {
        long length = Count(countWidth, $"{what} name length");
        if (length == 0) throw Fault($"{what} has an empty name at byte {_position}");
        if (length > Remaining) throw Fault($"{what} name length {length} exceeds the file");
        var bytes = Bytes(length);
        int nul = bytes.IndexOf((byte)0);
        // netCDF-C reads names as C strings: bytes after a NUL inside the counted length are padding.
        var name = nul >= 0 ? bytes[..nul] : bytes;
        string text;
        // names are UTF-8 (NetCDF Classic Format Specification); a name that is not cannot be looked up as written
        try { text = StrictUtf8.GetString(name); }
        catch (DecoderFallbackException) { throw Fault($"{what} name at byte {_position - length} is not valid UTF-8"); }
        SkipPadding(length);
        return text;
    }
}
