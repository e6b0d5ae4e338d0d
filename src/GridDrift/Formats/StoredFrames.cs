namespace GridDrift.Formats;

/// <summary>
/// Where the frames of a variable lie in its file when every frame (one time step, all other
/// dimensions) is one contiguous run of bytes in the variable's own type: frame t starts at
/// <see cref="Offset"/> + t × <see cref="Stride"/> and is <see cref="Bytes"/> long. A reader
/// that can say this lets the frame loop map the file and decode in place of copying.
/// </summary>
internal readonly record struct StoredFrames(long Offset, long Stride, long Bytes, bool BigEndian, long FrameCount);

/// <summary>A reader whose files store frames contiguously and uncompressed (the NetCDF classic formats).</summary>
internal interface IStoredFrameLayout
{
    /// <summary>The layout of <paramref name="variable"/>'s frames along dimension <paramref name="timeDimension"/>, or null where a frame is not one contiguous run.</summary>
    StoredFrames? LocateFrames(NcVariable variable, int timeDimension);
}
