using System.Buffers.Binary;
using System.Globalization;
using System.Runtime.InteropServices;

namespace GridDrift.Formats;

/// <summary>
/// What says a file is unchanged without reading it: size and last-write time, and on Linux also
/// the status-change time and the inode (statx(2)). The last two cannot be set by a program:
/// <c>cp -p</c> or <c>touch -r</c> can give new contents an old write time, but writing the file
/// moves its change time, and replacing it gives a new inode. Where statx is missing (another
/// system, an old kernel) the stamp is size and write time alone.
/// </summary>
internal static class FileStamp
{
    public static string Of(FileInfo info)
    {
        string basic = info.Length.ToString(CultureInfo.InvariantCulture) + "\t" + info.LastWriteTimeUtc.Ticks.ToString(CultureInfo.InvariantCulture);
        return Linux(info.FullName) is { } extra ? basic + "/" + extra : basic;
    }

    static bool _statxMissing = !OperatingSystem.IsLinux();

    static string? Linux(string path)
    {
        if (_statxMissing) return null;
        var buffer = new byte[256];
        try
        {
            if (statx(AtCurrentDirectory, path, 0, BasicStats, buffer) != 0) return null;
        }
        catch (Exception e) when (e is DllNotFoundException or EntryPointNotFoundException)
        {
            _statxMissing = true;
            return null;
        }
        // struct statx (linux/stat.h): stx_ino at 32, stx_ctime {i64 sec, u32 nsec} at 96, stx_dev_major/minor at 136/140
        long ino = BinaryPrimitives.ReadInt64LittleEndian(buffer.AsSpan(32));
        long changed = BinaryPrimitives.ReadInt64LittleEndian(buffer.AsSpan(96));
        uint changedNs = BinaryPrimitives.ReadUInt32LittleEndian(buffer.AsSpan(104));
        uint major = BinaryPrimitives.ReadUInt32LittleEndian(buffer.AsSpan(136)), minor = BinaryPrimitives.ReadUInt32LittleEndian(buffer.AsSpan(140));
        return string.Create(CultureInfo.InvariantCulture, $"{changed}.{changedNs:D9}/{ino}/{major}:{minor}");
    }

    const int AtCurrentDirectory = -100;
    const uint BasicStats = 0x7ff;

    [DllImport("libc", SetLastError = true)]
    static extern int statx(int dirfd, [MarshalAs(UnmanagedType.LPUTF8Str)] string path, int flags, uint mask, [Out] byte[] buffer);
}
