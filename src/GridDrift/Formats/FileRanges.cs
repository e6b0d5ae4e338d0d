using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats;

/// <summary>Reads of a file range that must come back whole (a read may return fewer bytes than asked).</summary>
internal static class FileRanges
{
    /// <summary>Fills <paramref name="target"/> from <paramref name="offset"/>; false when the file ends first.</summary>
    public static bool TryReadFully(SafeFileHandle handle, Span<byte> target, long offset)
    {
        int done = 0;
        while (done < target.Length)
        {
            int n = RandomAccess.Read(handle, target[done..], offset + done);
            if (n == 0) return false;
            done += n;
        }
        return true;
    }
}
