using PureHDF;
using PureHDF.Selections;
using PureHDF.VOL.Native;

namespace GridDrift.Formats.Hdf5;

/// <summary>
/// NetCDF-4 (HDF5) reader through PureHDF. It rebuilds the netCDF data model the way netCDF-C
/// does: dimension scales become dimensions (a scale whose NAME says it is "a netCDF dimension
/// but not a netCDF variable" is not listed as a variable), a variable's DIMENSION_LIST names
/// its dimensions, datasets without scales get phony dimensions, nested groups are flattened
/// into "group/name" paths, and netCDF's bookkeeping attributes are hidden.
/// </summary>
internal sealed class Hdf5Reader : IDatasetReader
{
    const string PureDimensionMarker = "This is a netCDF dimension but not a netCDF variable";
    static readonly HashSet<string> HiddenAttributes =
    [
        "CLASS", "NAME", "REFERENCE_LIST", "DIMENSION_LIST", "_Netcdf4Dimid", "_Netcdf4Coordinates",
        "_nc3_strict", "_NCProperties", "_SuperblockVersion", "_IsNetcdf4",
    ];

    readonly NativeFile _file;
    readonly object _gate = new();
    readonly Dictionary<NcVariable, NativeDataset> _datasets = new(ReferenceEqualityComparer.Instance);
    readonly HashSet<NcVariable> _bigEndian = new(ReferenceEqualityComparer.Instance);

    public string Path { get; }

    /// <summary>The checksummed metadata structures verified on open (kind, offset, bytes covered).</summary>
    internal IReadOnlyList<(string Kind, long At, int Covered)> VerifiedMetadata { get; }
    public string Format { get; }
    public IReadOnlyList<NcDimension> Dimensions { get; }
    public IReadOnlyList<NcAttribute> Attributes { get; }
    public IReadOnlyList<NcVariable> Variables { get; }

    Hdf5Reader(string path, NativeFile file, Hdf5MetadataCheck check)
    {
        Path = path;
        _file = file;
        var dims = new List<NcDimension>();
        var vars = new List<NcVariable>();
        var builder = new ModelBuilder(this, dims, vars, check);
        builder.Group(file, "");
        // HDF5 sizes are unsigned 64-bit: one beyond what a length can be is a corrupt dataspace
        if (dims.FirstOrDefault(d => d.Length < 0) is { } broken)
            throw new BadInputException(path, broken.Name, $"dimension length {(ulong)broken.Length} is out of range");
        Dimensions = dims;
        Variables = vars;
        Attributes = ReadAttributes(file, null);
        VerifiedMetadata = check.Verified;
        Format = file.AttributeExists("_nc3_strict") ? "netCDF-4 classic model" : "netCDF-4";
    }

    public static Hdf5Reader Open(string path)
    {
        // checksums first: nothing is read from metadata the HDF5 library itself would refuse
        using var check = Hdf5MetadataCheck.Open(path);
        NativeFile file;
        try
        {
            var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
            file = H5File.Open(new BoundedReadStream(stream, BoundedReadStream.BudgetFor(stream.Length)), leaveOpen: false);
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            throw new BadInputException(path, null, $"not a readable HDF5/netCDF-4 file ({e.Message})", e);
        }
        try
        {
            return new Hdf5Reader(path, file, check);
        }
        catch (BadInputException)
        {
            file.Dispose();
            throw;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            file.Dispose();
            throw new BadInputException(path, null, $"malformed netCDF-4 structure ({e.Message})", e);
        }
    }

    /// <summary>Builds dimensions and variables group by group; dimensions are visible in their group and below.</summary>
    sealed class ModelBuilder(Hdf5Reader owner, List<NcDimension> dims, List<NcVariable> vars, Hdf5MetadataCheck check)
    {
        // Dimension scales by object address, so DIMENSION_LIST references resolve without a name lookup.
        readonly Dictionary<ulong, NcDimension> _scales = new();
        // Objects PureHDF could not open, by address: a reference to one still names a dimension.
        readonly Dictionary<ulong, string> _unopened = new();
        Dictionary<string, NcDimension> _scope = new();

        public void Group(NativeGroup group, string prefix)
        {
            var links = Hdf5Links.Children(group);
            foreach (var link in links) check.Object(link.Address);
            var datasets = links.Where(l => l.Object is NativeDataset).Select(l => (NativeDataset)l.Object!).ToList();
            var scope = new Dictionary<string, NcDimension>(_scope);
            foreach (var ds in datasets.Where(IsDimensionScale).OrderBy(DimensionId))
            {
                var space = ds.Space;
                long length = space.Rank == 0 ? 1 : (long)space.Dimensions[0];
                bool unlimited = space.Rank > 0 && space.MaxDimensions[0] == ulong.MaxValue;
                var dim = new NcDimension(prefix + ds.Name, length, unlimited);
                dims.Add(dim);
                scope[ds.Name] = dim;
                _scales[Hdf5Links.AddressOf(ds)] = dim;
            }
            foreach (var failed in links.Where(l => l.Error is not null))
                _unopened[failed.Address] = failed.Name;

            var phony = new Dictionary<long, NcDimension>();
            foreach (var ds in datasets)
            {
                if (IsDimensionScale(ds) && IsPureDimension(ds)) continue;
                var v = Variable(ds, prefix, scope, phony);
                owner._datasets[v] = ds;
                vars.Add(v);
            }
            foreach (var failed in links.Where(l => l.Error is not null && !scope.ContainsKey(l.Name)))
                if (!dims.Any(d => d.Name == prefix + failed.Name))
                    vars.Add(new NcVariable(prefix + failed.Name, NcType.Unsupported, [], [], $"unreadable object ({failed.Error!.Message})"));

            var saved = _scope;
            _scope = scope;
            foreach (var sub in links.Where(l => l.Object is NativeGroup))
                Group((NativeGroup)sub.Object!, prefix + sub.Name + "/");
            _scope = saved;
        }

        NcVariable Variable(NativeDataset ds, string prefix, Dictionary<string, NcDimension> scope, Dictionary<long, NcDimension> phony)
        {
            var space = ds.Space;
            int rank = space.Type == H5DataspaceType.Scalar ? 0 : space.Rank;
            var shape = rank == 0 ? [] : space.Dimensions;
            var listed = DimensionList(ds, rank, prefix, shape);
            var vdims = new NcDimension[rank];
            for (int d = 0; d < rank; d++)
            {
                if (listed?[d] is { } dim && (dim.Length == (long)shape[d] || dim.IsUnlimited))
                {
                    vdims[d] = dim;
                    if (dim.IsUnlimited) dim.Length = Math.Max(dim.Length, (long)shape[d]);
                }
                else if (IsDimensionScale(ds) && d == 0 && scope.TryGetValue(ds.Name, out var self) && self.Length == (long)shape[d])
                    vdims[d] = self;
                else
                {
                    long len = (long)shape[d];
                    if (!phony.TryGetValue(len, out var p))
                    {
                        p = new NcDimension($"{prefix}phony_dim_{phony.Count}", len, false);
                        phony[len] = p;
                        dims.Add(p);
                    }
                    vdims[d] = p;
                }
            }
            var (type, kind) = Hdf5Types.Classify(ds.Type);
            var variable = new NcVariable(prefix + ds.Name, type, vdims, owner.ReadAttributes(ds, prefix + ds.Name), kind);
            // a corrupt dataspace can declare sizes no file holds: refused here, before any count is multiplied out
            try { _ = checked(variable.ElementCount * (NcTypes.IsNumeric(type) || type == NcType.Char ? NcTypes.SizeOf(type) : 1)); }
            catch (OverflowException) { throw new BadInputException(owner.Path, variable.Name, "declares more elements than any file can hold"); }
            if (NcTypes.IsNumeric(type) && NcTypes.SizeOf(type) > 1 && Hdf5ByteOrder.IsBigEndian(ds.Type) && Hdf5ByteOrder.RelabelLittleEndian(ds.Type))
                owner._bigEndian.Add(variable);
            return variable;
        }

        /// <summary>Dimensions from DIMENSION_LIST object references (HDF5 Dimension Scale specification).</summary>
        NcDimension?[]? DimensionList(NativeDataset ds, int rank, string prefix, ulong[] shape)
        {
            if (rank == 0 || !ds.AttributeExists("DIMENSION_LIST")) return null;
            NativeObjectReference1[][] refs;
            try
            {
                refs = ds.Attribute("DIMENSION_LIST").Read<NativeObjectReference1[][]>();
            }
            catch (Exception e) when (e is not OutOfMemoryException)
            {
                return null; // fall back to matching by scale or phony dimensions
            }
            var result = new NcDimension?[rank];
            for (int d = 0; d < rank && d < refs.Length; d++)
            {
                if (refs[d].Length == 0) continue;
                ulong address = Hdf5Links.AddressOf(refs[d][0]);
                if (_scales.TryGetValue(address, out var dim)) result[d] = dim;
                else if (_unopened.TryGetValue(address, out var name))
                {
                    // The scale's own header could not be read: its length is this variable's extent.
                    var made = new NcDimension(prefix + name, (long)shape[d], false);
                    dims.Add(made);
                    _scales[address] = made;
                    result[d] = made;
                }
            }
            return result;
        }
    }

    static int DimensionId(NativeDataset ds)
    {
        try { return ds.AttributeExists("_Netcdf4Dimid") ? ds.Attribute("_Netcdf4Dimid").Read<int[]>()[0] : int.MaxValue; }
        catch (Exception e) when (e is not OutOfMemoryException) { return int.MaxValue; }
    }

    static bool IsDimensionScale(NativeDataset ds) =>
        ds.AttributeExists("CLASS") && TryText(ds.Attribute("CLASS")) == "DIMENSION_SCALE";

    static bool IsPureDimension(NativeDataset ds) =>
        ds.AttributeExists("NAME") && (TryText(ds.Attribute("NAME")) ?? "").StartsWith(PureDimensionMarker, StringComparison.Ordinal);

    static string? TryText(IH5Attribute a)
    {
        try { return Hdf5Types.ReadAttribute(a).AsText(); }
        catch (Exception e) when (e is not OutOfMemoryException) { return null; }
    }

    List<NcAttribute> ReadAttributes(NativeObject obj, string? owner)
    {
        var list = new List<NcAttribute>();
        foreach (var a in obj.Attributes())
        {
            if (HiddenAttributes.Contains(a.Name)) continue;
            try
            {
                list.Add(Hdf5Types.ReadAttribute(a));
            }
            catch (Exception e) when (e is not OutOfMemoryException)
            {
                list.Add(new NcAttribute(a.Name, NcType.Unsupported, $"unreadable ({e.Message})"));
            }
        }
        return list;
    }

    public void ReadRaw(NcVariable variable, ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<byte> destination)
    {
        var ds = Dataset(variable);
        RawValues.RequireNumericOrChar(Path, variable);
        int size = NcTypes.SizeOf(variable.Type);
        var shape = variable.Shape;
        Hyperslab.Validate(Path, variable, shape, start, count, destination.Length, size);
        if (destination.Length == 0) return;
        try
        {
            lock (_gate)
            {
                // a read that failed inside the HDF5 library may leave its state broken: every later read of this file is refused instead of entered
                if (_fault is { } earlier) throw new BadInputException(Path, variable.Name, $"data cannot be read ({earlier})");
                if (shape.Length == 0)
                {
                    ReadTyped(ds, variable.Type, destination, new AllSelection(), [1]);
                    if (_bigEndian.Contains(variable)) RawValues.SwapInPlace(destination, size);
                    return;
                }
                var starts = new ulong[shape.Length];
                var blocks = new ulong[shape.Length];
                for (int d = 0; d < shape.Length; d++) { starts[d] = (ulong)start[d]; blocks[d] = (ulong)count[d]; }
                ReadTyped(ds, variable.Type, destination, new HyperslabSelection(shape.Length, starts, blocks), blocks);
            }
            if (_bigEndian.Contains(variable)) RawValues.SwapInPlace(destination, size);
            ReleaseChunkBuffers(destination.Length);
        }
        // whatever the HDF5 library throws on corrupt data (overflows and out-of-range sizes included) is the file's fault
        catch (Exception e) when (e is not BadInputException)
        {
            lock (_gate) _fault ??= e.Message;
            throw new BadInputException(Path, variable.Name, $"data cannot be read ({e.Message})", e);
        }
    }

    string? _fault;

    /// <summary>The HDF5 reader allocates each compressed chunk, its decompressed copy and each filter's output afresh: about 2.5 × a frame for one-frame chunks with shuffle and deflate.</summary>
    static void ReleaseChunkBuffers(int bytesRead) => ChunkGarbage.HandedOut((long)bytesRead * 5 / 2);

    static void ReadTyped(NativeDataset ds, NcType type, Span<byte> destination, Selection selection, ulong[] memoryDims)
    {
        switch (type)
        {
            case NcType.Byte: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, sbyte>(destination), selection, null, memoryDims); break;
            case NcType.Char:
            case NcType.UByte: ds.Read(destination, selection, null, memoryDims); break;
            case NcType.Short: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, short>(destination), selection, null, memoryDims); break;
            case NcType.UShort: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, ushort>(destination), selection, null, memoryDims); break;
            case NcType.Int: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, int>(destination), selection, null, memoryDims); break;
            case NcType.UInt: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, uint>(destination), selection, null, memoryDims); break;
            case NcType.Float: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, float>(destination), selection, null, memoryDims); break;
            case NcType.Double: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, double>(destination), selection, null, memoryDims); break;
            case NcType.Int64: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, long>(destination), selection, null, memoryDims); break;
            case NcType.UInt64: ds.Read(System.Runtime.InteropServices.MemoryMarshal.Cast<byte, ulong>(destination), selection, null, memoryDims); break;
            default: throw new ArgumentOutOfRangeException(nameof(type));
        }
    }

    public string[] ReadStrings(NcVariable variable)
    {
        var ds = Dataset(variable);
        if (variable.Type != NcType.String)
            throw new BadInputException(Path, variable.Name, $"is of type {variable.TypeName}, not string");
        try
        {
            lock (_gate) return ds.Read<string[]>();
        }
        catch (Exception e) when (e is not BadInputException)
        {
            throw new BadInputException(Path, variable.Name, $"strings cannot be read ({e.Message})", e);
        }
    }

    NativeDataset Dataset(NcVariable variable) =>
        _datasets.TryGetValue(variable, out var ds) ? ds
            : throw new ArgumentException($"variable {variable.Name} does not belong to {Path}", nameof(variable));

    public void Dispose() => _file.Dispose();
}
