using System.Buffers;
using System.Runtime.InteropServices;
using System.Text;
using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats.Classic;

/// <summary>
/// Writer of the NetCDF classic formats. Define dimensions, attributes and variables, call
/// <see cref="EndDefinitions"/>, then write fixed variables and append records one frame at a
/// time; <see cref="Commit"/> fills what was never written, writes the header with the final
/// record count and renames the temporary file to its final name. Disposed without a commit,
/// the temporary file is deleted: an interrupted run never leaves a half-written product.
/// CDF-5 is chosen by itself when a variable is too large for CDF-2 or has a CDF-5-only type.
/// </summary>
internal sealed class ClassicWriter : IDisposable
{
    /// <summary>CDF-2 stores vsize in 32 bits; netCDF-C limits a variable (or a record's slab) to 2^32 − 4 bytes.</summary>
    const long Cdf2MaxVariableBytes = 4294967292;

    readonly string _finalPath;
    readonly string _tempPath;
    readonly SafeFileHandle _handle;
    readonly ClassicVariant? _requested;
    readonly int _headerReserve;
    readonly List<NcDimension> _dimensions = new();
    readonly List<NcAttribute> _globals = new();
    readonly List<Definition> _variables = new();
    bool _defined;
    bool _committed;
    long _recordSize;
    long _numrecs;

    public ClassicVariant Variant { get; private set; }

    public sealed class Definition
    {
        internal Definition(string name, NcType type, NcDimension[] dims, List<NcAttribute> attributes)
        {
            Name = name; Type = type; Dimensions = dims; Attributes = attributes;
        }
        public string Name { get; }
        public NcType Type { get; }
        public NcDimension[] Dimensions { get; }
        public List<NcAttribute> Attributes { get; }
        public bool IsRecord => Dimensions.Length > 0 && Dimensions[0].IsUnlimited;
        internal long Begin;
        internal long SlabBytes;
        internal long[] InnerShape = [];
        internal bool FixedWritten;
        internal readonly List<bool> RecordsWritten = new();
    }

    ClassicWriter(string path, ClassicVariant? variant, int headerReserve)
    {
        _finalPath = System.IO.Path.GetFullPath(path);
        var dir = System.IO.Path.GetDirectoryName(_finalPath)!;
        _tempPath = System.IO.Path.Combine(dir, "." + System.IO.Path.GetFileName(_finalPath) + "." + Guid.NewGuid().ToString("N")[..8] + ".part");
        _handle = File.OpenHandle(_tempPath, FileMode.CreateNew, FileAccess.ReadWrite, FileShare.None);
        _requested = variant;
        _headerReserve = headerReserve;
    }

    /// <param name="variant">null: CDF-2 unless the content needs CDF-5.</param>
    /// <param name="headerReserve">spare header bytes, so attributes can grow in place later.</param>
    public static ClassicWriter Create(string path, ClassicVariant? variant = null, int headerReserve = 1024) =>
        new(path, variant, headerReserve);

    public NcDimension AddDimension(string name, long length, bool unlimited = false)
    {
        RequireDefineMode();
        if (unlimited && _dimensions.Any(d => d.IsUnlimited))
            throw new InvalidOperationException("a classic file has at most one unlimited dimension");
        var dim = new NcDimension(name, unlimited ? 0 : length, unlimited);
        _dimensions.Add(dim);
        return dim;
    }

    public void AddAttribute(NcAttribute attribute)
    {
        RequireDefineMode();
        _globals.RemoveAll(a => a.Name == attribute.Name);
        _globals.Add(attribute);
    }

    public Definition AddVariable(string name, NcType type, IEnumerable<NcDimension> dimensions, IEnumerable<NcAttribute>? attributes = null)
    {
        RequireDefineMode();
        if (type is NcType.String or NcType.Unsupported)
            throw new ArgumentException($"classic files cannot hold {NcTypes.CdlName(type)} variables");
        var dims = dimensions.ToArray();
        for (int i = 1; i < dims.Length; i++)
            if (dims[i].IsUnlimited) throw new ArgumentException("the unlimited dimension must come first");
        var v = new Definition(name, type, dims, attributes?.ToList() ?? new List<NcAttribute>());
        _variables.Add(v);
        return v;
    }

    void RequireDefineMode()
    {
        if (_defined) throw new InvalidOperationException("definitions are closed");
    }

    /// <summary>Chooses the variant and lays out the data; no definitions may follow.</summary>
    public void EndDefinitions()
    {
        RequireDefineMode();
        _defined = true;
        foreach (var v in _variables)
        {
            long elements = 1;
            foreach (var d in v.Dimensions) if (!d.IsUnlimited) elements = checked(elements * d.Length);
            v.SlabBytes = checked(elements * NcTypes.SizeOf(v.Type));
            v.InnerShape = v.Dimensions.Skip(v.IsRecord ? 1 : 0).Select(d => d.Length).ToArray();
        }
        Variant = ChooseVariant();
        if (Layout() > int.MaxValue && Variant == ClassicVariant.Cdf1)
        {
            Variant = ClassicVariant.Cdf2; // 32-bit offsets cannot reach the data: widen them and lay out again
            Layout();
        }
    }

    /// <summary>Assigns each variable its offset; returns where the data end.</summary>
    long Layout()
    {
        long offset = ClassicLayout.Pad4(HeaderBytes() + _headerReserve);
        foreach (var v in _variables.Where(v => !v.IsRecord))
        {
            v.Begin = offset;
            offset += ClassicLayout.Pad4(v.SlabBytes);
        }
        var records = _variables.Where(v => v.IsRecord).ToList();
        foreach (var v in records)
        {
            v.Begin = offset;
            offset += ClassicLayout.Pad4(v.SlabBytes);
        }
        _recordSize = records.Count == 1 ? records[0].SlabBytes : records.Sum(v => ClassicLayout.Pad4(v.SlabBytes));
        return offset;
    }

    ClassicVariant ChooseVariant()
    {
        bool needs5 = _variables.Any(v => NcTypes.NeedsCdf5(v.Type) || v.SlabBytes > Cdf2MaxVariableBytes)
                      || _dimensions.Any(d => d.Length > int.MaxValue)
                      || _globals.Concat(_variables.SelectMany(v => v.Attributes)).Any(a => NcTypes.NeedsCdf5(a.Type));
        if (needs5) return ClassicVariant.Cdf5;
        return _requested ?? ClassicVariant.Cdf2;
    }

    /// <summary>Writes a whole fixed-size variable.</summary>
    public void Write<T>(Definition v, ReadOnlySpan<T> values) where T : unmanaged
    {
        if (v.IsRecord) throw new InvalidOperationException($"{v.Name} is a record variable: use WriteRecord");
        WriteSlab(v, v.Begin, values);
        v.FixedWritten = true;
    }

    /// <summary>Writes one record (one frame) of a record variable; records may come in any order.</summary>
    public void WriteRecord<T>(Definition v, long record, ReadOnlySpan<T> values) where T : unmanaged
    {
        if (!v.IsRecord) throw new InvalidOperationException($"{v.Name} is not a record variable");
        WriteSlab(v, v.Begin + record * _recordSize, values);
        while (v.RecordsWritten.Count <= record) v.RecordsWritten.Add(false);
        v.RecordsWritten[(int)record] = true;
        _numrecs = Math.Max(_numrecs, record + 1);
    }

    void WriteSlab<T>(Definition v, long offset, ReadOnlySpan<T> values) where T : unmanaged
    {
        if (!_defined) throw new InvalidOperationException("call EndDefinitions before writing data");
        int size = NcTypes.SizeOf(v.Type);
        if (Marshal.SizeOf<T>() != size || !Matches<T>(v.Type))
            throw new ArgumentException($"{v.Name} is {NcTypes.CdlName(v.Type)}; values are {typeof(T).Name}");
        long bytes = (long)values.Length * size;
        if (bytes != v.SlabBytes)
            throw new ArgumentException($"{v.Name} needs {v.SlabBytes / size} values, got {values.Length}");
        var source = MemoryMarshal.AsBytes(values);
        const int chunk = 1 << 22;
        byte[] buffer = ArrayPool<byte>.Shared.Rent((int)Math.Min(bytes, chunk));
        try
        {
            for (long done = 0; done < bytes; done += chunk)
            {
                int n = (int)Math.Min(chunk, bytes - done);
                var piece = buffer.AsSpan(0, n);
                source.Slice((int)done, n).CopyTo(piece);
                RawValues.SwapInPlace(piece, size);
                RandomAccess.Write(_handle, piece, offset + done);
            }
        }
        finally
        {
            ArrayPool<byte>.Shared.Return(buffer);
        }
    }

    static bool Matches<T>(NcType type) => type switch
    {
        NcType.Byte => typeof(T) == typeof(sbyte),
        NcType.Char or NcType.UByte => typeof(T) == typeof(byte),
        NcType.Short => typeof(T) == typeof(short),
        NcType.UShort => typeof(T) == typeof(ushort),
        NcType.Int => typeof(T) == typeof(int),
        NcType.UInt => typeof(T) == typeof(uint),
        NcType.Float => typeof(T) == typeof(float),
        NcType.Double => typeof(T) == typeof(double),
        NcType.Int64 => typeof(T) == typeof(long),
        NcType.UInt64 => typeof(T) == typeof(ulong),
        _ => false,
    };

    /// <summary>Fills what was never written, writes the header and moves the file to its final name.</summary>
    public void Commit()
    {
        if (!_defined) EndDefinitions();
        foreach (var v in _variables)
        {
            if (v.IsRecord)
            {
                for (long r = 0; r < _numrecs; r++)
                    if (r >= v.RecordsWritten.Count || !v.RecordsWritten[(int)r])
                        Fill(v, v.Begin + r * _recordSize);
            }
            else if (!v.FixedWritten) Fill(v, v.Begin);
        }
        var header = EncodeHeader(_numrecs);
        RandomAccess.Write(_handle, header, 0);
        // A file whose last record is shorter than its padded size still ends at the padded size.
        long end = _variables.Count == 0 ? header.Length : _variables.Max(v => v.IsRecord
            ? (_numrecs == 0 ? v.Begin : v.Begin + (_numrecs - 1) * _recordSize + v.SlabBytes)
            : v.Begin + v.SlabBytes);
        if (RandomAccess.GetLength(_handle) < end) RandomAccess.SetLength(_handle, end);
        RandomAccess.FlushToDisk(_handle);
        _handle.Dispose();
        File.Move(_tempPath, _finalPath, overwrite: true);
        _committed = true;
    }

    void Fill(Definition v, long offset)
    {
        var pattern = FillValues.Pattern(v.Type, v.Attributes.Find("_FillValue"));
        const int chunk = 1 << 20;
        var buffer = new byte[(int)Math.Min(v.SlabBytes, chunk)];
        for (int i = 0; i < buffer.Length; i += pattern.Length) pattern.CopyTo(buffer, i);
        for (long done = 0; done < v.SlabBytes; done += chunk)
            RandomAccess.Write(_handle, buffer.AsSpan(0, (int)Math.Min(chunk, v.SlabBytes - done)), offset + done);
    }

    long HeaderBytes() => EncodeHeader(0).Length;

    byte[] EncodeHeader(long numrecs)
    {
        var w = new HeaderWriter(Variant);
        w.Bytes([(byte)'C', (byte)'D', (byte)'F', (byte)w.Variant]);
        w.Count(numrecs);
        if (_dimensions.Count == 0) w.Absent();
        else
        {
            w.UInt32(ClassicLayout.TagDimension);
            w.Count(_dimensions.Count);
            foreach (var d in _dimensions)
            {
                w.Name(d.Name);
                w.Count(d.IsUnlimited ? 0 : d.Length);
            }
        }
        w.Attributes(_globals);
        if (_variables.Count == 0) w.Absent();
        else
        {
            w.UInt32(ClassicLayout.TagVariable);
            w.Count(_variables.Count);
            foreach (var v in _variables)
            {
                w.Name(v.Name);
                w.Count(v.Dimensions.Length);
                foreach (var d in v.Dimensions) w.Count(_dimensions.IndexOf(d));
                w.Attributes(v.Attributes);
                w.UInt32((uint)v.Type);
                long vsize = ClassicLayout.Pad4(v.SlabBytes);
                w.Count(w.Variant != ClassicVariant.Cdf5 && vsize > uint.MaxValue ? uint.MaxValue : vsize);
                w.Offset(v.Begin);
            }
        }
        return w.ToArray();
    }

    public void Dispose()
    {
        if (_committed) return;
        _handle.Dispose();
        try { File.Delete(_tempPath); } catch (IOException) { }
    }

    sealed class HeaderWriter(ClassicVariant variant)
    {
        readonly MemoryStream _stream = new();
        public ClassicVariant Variant { get; } = variant;

        public void Bytes(ReadOnlySpan<byte> b) => _stream.Write(b);
        public void UInt32(uint v) { Span<byte> b = stackalloc byte[4]; System.Buffers.Binary.BinaryPrimitives.WriteUInt32BigEndian(b, v); Bytes(b); }
        public void UInt64(ulong v) { Span<byte> b = stackalloc byte[8]; System.Buffers.Binary.BinaryPrimitives.WriteUInt64BigEndian(b, v); Bytes(b); }
        public void Count(long n) { if (Variant == ClassicVariant.Cdf5) UInt64((ulong)n); else UInt32(checked((uint)n)); }
        public void Offset(long n) { if (Variant == ClassicVariant.Cdf1) UInt32(checked((uint)n)); else UInt64((ulong)n); }
        public void Absent() { UInt32(0); Count(0); }
        public void Pad(long unpadded) { for (long i = unpadded; i < ClassicLayout.Pad4(unpadded); i++) _stream.WriteByte(0); }

        public void Name(string name)
        {
            var bytes = Encoding.UTF8.GetBytes(name.Normalize(NormalizationForm.FormC));
            Count(bytes.Length);
            Bytes(bytes);
            Pad(bytes.Length);
        }

        public void Attributes(IReadOnlyList<NcAttribute> attributes)
        {
            if (attributes.Count == 0) { Absent(); return; }
            UInt32(ClassicLayout.TagAttribute);
            Count(attributes.Count);
            foreach (var a in attributes)
            {
                Name(a.Name);
                byte[] payload;
                NcType type = a.Type;
                switch (a.Values)
                {
                    case string s: type = NcType.Char; payload = Encoding.UTF8.GetBytes(s); break;
                    case string[] s: type = NcType.Char; payload = Encoding.UTF8.GetBytes(string.Join("\n", s)); break;
                    case Array array:
                        int size = NcTypes.SizeOf(type);
                        payload = new byte[array.Length * size];
                        Buffer.BlockCopy(array, 0, payload, 0, payload.Length);
                        RawValues.SwapInPlace(payload, size);
                        break;
                    default: throw new ArgumentException($"attribute {a.Name} has no values");
                }
                UInt32((uint)type);
                Count(type == NcType.Char ? payload.Length : payload.Length / NcTypes.SizeOf(type));
                Bytes(payload);
                Pad(payload.Length);
            }
        }

        public byte[] ToArray() => _stream.ToArray();
    }
}
