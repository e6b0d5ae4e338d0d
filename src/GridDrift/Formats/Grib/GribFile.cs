using System.IO.MemoryMappedFiles;

namespace GridDrift.Formats.Grib;

/// <summary>A GRIB file mapped read-only: ecCodes decodes its messages where they lie, without a copy.</summary>
internal sealed unsafe class GribFile : IDisposable
{
    readonly MemoryMappedFile _map;
    readonly MemoryMappedViewAccessor _view;
    public byte* Start { get; }
    public long Length { get; }

    GribFile(MemoryMappedFile map, MemoryMappedViewAccessor view, long length)
    {
        _map = map;
        _view = view;
        Length = length;
        byte* start = null;
        view.SafeMemoryMappedViewHandle.AcquirePointer(ref start);
        Start = start + view.PointerOffset;
    }

    public static GribFile Open(string path)
    {
        long length = new FileInfo(path).Length;
        if (length == 0) throw new InvalidDataException("the file is empty");
        var map = MemoryMappedFile.CreateFromFile(path, FileMode.Open, null, 0, MemoryMappedFileAccess.Read);
        try { return new GribFile(map, map.CreateViewAccessor(0, length, MemoryMappedFileAccess.Read), length); }
        catch
        {
            map.Dispose();
            throw;
        }
    }

    public ReadOnlySpan<byte> Span(long offset, int length) => new(Start + offset, length);

    public void Dispose()
    {
        _view.SafeMemoryMappedViewHandle.ReleasePointer();
        _view.Dispose();
        _map.Dispose();
    }
}
