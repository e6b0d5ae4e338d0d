using System.Runtime.InteropServices;

namespace GridDrift.Frames;

/// <summary>
/// A zeroed native array for state that spans hundreds of megabytes (a climatology's slots ×
/// cells). On Linux it asks for transparent huge pages (madvise MADV_HUGEPAGE) before first
/// touch: the kernel then backs it in 2 MiB pages, and first writes fault 512 times less often
/// (measured: 0.8 s of page faults for a 450 MB state with 4 KiB pages). Elsewhere, or where
/// the kernel declines, it is an ordinary allocation.
/// </summary>
public sealed unsafe class LargeBuffer<T> : IDisposable where T : unmanaged
{
    const nuint HugePage = 2 << 20;
    const int MadvHugePage = 14;
    T* _data;
    readonly nuint _bytes;

    public int Length { get; }

    public LargeBuffer(long length)
    {
        if (length < 0 || length > Array.MaxLength) throw new ArgumentOutOfRangeException(nameof(length), $"{length} elements is more than one buffer holds");
        Length = (int)length;
        nuint bytes = (nuint)length * (nuint)sizeof(T);
        _bytes = Math.Max(HugePage, (bytes + HugePage - 1) / HugePage * HugePage);
        _data = (T*)NativeMemory.AlignedAlloc(_bytes, HugePage);
        if (OperatingSystem.IsLinux() && bytes >= HugePage)
            try { _ = LinuxMemory.madvise(_data, _bytes, MadvHugePage); }
            catch (DllNotFoundException) { }
            catch (EntryPointNotFoundException) { }
        NativeMemory.Clear(_data, _bytes);
        GC.AddMemoryPressure((long)_bytes);
    }

    public Span<T> Span => _data == null ? throw new ObjectDisposedException(nameof(LargeBuffer<T>)) : new(_data, Length);

    public void Dispose()
    {
        Free();
        GC.SuppressFinalize(this);
    }

    ~LargeBuffer() => Free();

    void Free()
    {
        if (_data == null) return;
        NativeMemory.AlignedFree(_data);
        _data = null;
        GC.RemoveMemoryPressure((long)_bytes);
    }
}

static unsafe class LinuxMemory
{
    [DllImport("libc", SetLastError = true)]
    internal static extern int madvise(void* address, nuint length, int advice);
}
