using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats.Classic;

/// <summary>
/// Reader of the NetCDF classic formats CDF-1, CDF-2 and CDF-5, written from the published
/// specification (NetCDF User's Guide, Appendix "File Format Specification"; PnetCDF's CDF-5
/// specification). Big-endian on disk; record variables interleaved one record at a time;
/// numrecs may be STREAMING (all ones), in which case it follows from the file size.
/// </summary>
internal sealed class ClassicReader : IDatasetReader, IStoredFrameLayout
{
    readonly SafeFileHandle _handle;
    readonly Dictionary<NcVariable, VariableLayout> _layouts = new(ReferenceEqualityComparer.Instance);

    public string Path { get; }
    public ClassicVariant Variant { get; }
    public string Format => ClassicLayout.FormatName(Variant);
    public IReadOnlyList<NcDimension> Dimensions { get; }
    public IReadOnlyList<NcAttribute> Attributes { get; }
    public IReadOnlyList<NcVariable> Variables { get; }
    public long RecordCount { get; }
    /// <summary>Bytes from one record to the next.</summary>
    public long RecordSize { get; }

    internal sealed record VariableLayout(long Begin, long[] InnerShape, bool IsRecord, long SlabBytes);

    ClassicReader(SafeFileHandle handle, string path, ClassicVariant variant, IReadOnlyList<NcDimension> dims,
        IReadOnlyList<NcAttribute> attributes, IReadOnlyList<NcVariable> variables,
        Dictionary<NcVariable, VariableLayout> layouts, long recordCount, long recordSize)
    {
        _handle = handle;
        Path = path;
        Variant = variant;
        Dimensions = dims;
        Attributes = attributes;
        Variables = variables;
        _layouts = layouts;
        RecordCount = recordCount;
        RecordSize = recordSize;
    }

    public static ClassicReader Open(string path)
    {
        var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        try
        {
            return ClassicHeaderParser.Parse(handle, path, RandomAccess.GetLength(handle),
                (variant, dims, attrs, vars, layouts, numrecs, recsize) =>
                    new ClassicReader(handle, path, variant, dims, attrs, vars, layouts, numrecs, recsize));
        }
        catch
        {
            handle.Dispose();
            throw;
        }
    }

    public void ReadRaw(NcVariable variable, ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<byte> destination)
    {
        if (!_layouts.TryGetValue(variable, out var layout))
            throw new ArgumentException($"variable {variable.Name} does not belong to {Path}", nameof(variable));
        int size = NcTypes.SizeOf(variable.Type);
        var shape = variable.Shape;
        if (variable.IsRecordVariable) shape[0] = RecordCount;
        Hyperslab.Validate(Path, variable, shape, start, count, destination.Length, size);
        if (destination.Length == 0) return;

        var reader = new RunReader(this, variable, destination);
        try { SlabWalker.ForEachRun(layout.Begin, layout.IsRecord, RecordSize, layout.InnerShape, start, count, size, ref reader); }
        catch (IOException e) { throw new BadInputException(Path, variable.Name, $"data cannot be read ({e.Message})", e); }
        RawValues.SwapInPlace(destination, size);
    }

    ref struct RunReader(ClassicReader owner, NcVariable variable, Span<byte> buffer) : IRunAction
    {
        readonly Span<byte> _buffer = buffer;

        public void Run(long fileOffset, int bufferOffset, int bytes)
        {
            var target = _buffer.Slice(bufferOffset, bytes);
            while (target.Length > 0)
            {
                int got = RandomAccess.Read(owner._handle, target, fileOffset);
                if (got <= 0)
                    throw new BadInputException(owner.Path, variable.Name, $"file ends at byte {fileOffset}, inside the variable's data");
                target = target[got..];
                fileOffset += got;
            }
        }
    }

    /// <summary>
    /// A frame along the first dimension is contiguous: a record variable's frame is its slab of
    /// one record, a fixed-size variable's frames follow one another. Only whole frames that the
    /// file's length covers are counted, so a mapping never reads past its end.
    /// </summary>
    public StoredFrames? LocateFrames(NcVariable variable, int timeDimension)
    {
        if (timeDimension != 0 || !_layouts.TryGetValue(variable, out var layout)) return null;
        long frameBytes = NcTypes.SizeOf(variable.Type) * layout.InnerShape.Skip(layout.IsRecord ? 0 : 1).Aggregate(1L, (n, d) => n * d);
        long stride = layout.IsRecord ? RecordSize : frameBytes;
        long frames = layout.IsRecord ? RecordCount : variable.Dimensions[0].Length;
        if (frames > 0 && layout.Begin + (frames - 1) * stride + frameBytes > RandomAccess.GetLength(_handle)) return null;
        return new StoredFrames(layout.Begin, stride, frameBytes, BigEndian: true, frames);
    }

    public string[] ReadStrings(NcVariable variable) =>
        throw new BadInputException(Path, variable.Name, "classic files hold no string variables");

    public void Dispose() => _handle.Dispose();
}
