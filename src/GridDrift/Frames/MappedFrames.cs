using System.IO.MemoryMappedFiles;
using GridDrift.Formats;

namespace GridDrift.Frames;

/// <summary>
/// The frames of a record whose files store them contiguously and uncompressed, reached by
/// mapping the files a window at a time instead of copying frames into buffers: the frame loop
/// reads the page cache once, decoding as it goes (<see cref="BigEndianFloats"/>). Only one
/// window is mapped at once, and it is unmapped before the next, so the pages a run holds stay
/// those of the frames in flight. Made by <see cref="FrameSource.TryMap"/>.
/// </summary>
internal sealed unsafe class MappedFrames : IDisposable
{
    internal readonly record struct Piece(string Path, StoredFrames Layout, int First);

    readonly Piece[] _pieces;
    readonly MemoryMappedFile?[] _files;
    readonly List<(MemoryMappedViewAccessor View, int Piece, int First, int Last, nint Base)> _window = [];

    public BigEndianFloats Decoder { get; }

    readonly string _variable;

    internal MappedFrames(Piece[] pieces, float fill, string variable)
    {
        _variable = variable;
        _pieces = pieces;
        _files = new MemoryMappedFile?[pieces.Length];
        Decoder = new BigEndianFloats(fill);
    }

    /// <summary>Maps frames [first, last] of the record (global indices), unmapping the window before.</summary>
    public void Map(int first, int last)
    {
        Unmap();
        for (int p = 0; p < _pieces.Length; p++)
        {
            var piece = _pieces[p];
            int a = Math.Max(first, piece.First), b = (int)Math.Min(last, piece.First + piece.Layout.FrameCount - 1);
            if (a > b) continue;
            long from = piece.Layout.Offset + (a - piece.First) * piece.Layout.Stride;
            long length = (b - a) * piece.Layout.Stride + piece.Layout.Bytes;
            MemoryMappedViewAccessor view;
            try
            {
                var file = _files[p] ??= MemoryMappedFile.CreateFromFile(piece.Path, FileMode.Open, null, 0, MemoryMappedFileAccess.Read);
                if (file.SafeMemoryMappedFileHandle.IsInvalid || new FileInfo(piece.Path).Length < from + length)
                    throw new IOException($"the file is now shorter than its header says ({from + length} bytes)");
                view = file.CreateViewAccessor(from, length, MemoryMappedFileAccess.Read);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                throw new BadInputException(piece.Path, _variable, "cannot be read: " + e.Message);
            }
            byte* at = null;
            view.SafeMemoryMappedViewHandle.AcquirePointer(ref at);
            _window.Add((view, p, a, b, (nint)(at + view.PointerOffset)));
        }
    }

    /// <summary>The address of frame <paramref name="frame"/>'s first value; the frame must lie in the mapped window.</summary>
    public byte* Address(int frame)
    {
        foreach (var w in _window)
            if (frame >= w.First && frame <= w.Last) return (byte*)w.Base + (frame - w.First) * _pieces[w.Piece].Layout.Stride;
        throw new ArgumentOutOfRangeException(nameof(frame), $"frame {frame} is not in the mapped window");
    }

    void Unmap()
    {
        foreach (var w in _window)
        {
            w.View.SafeMemoryMappedViewHandle.ReleasePointer();
            w.View.Dispose();
        }
        _window.Clear();
    }

    public void Dispose()
    {
        Unmap();
        foreach (var f in _files) f?.Dispose();
    }
}
