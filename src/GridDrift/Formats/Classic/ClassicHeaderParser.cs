using System.Text;
using Microsoft.Win32.SafeHandles;

namespace GridDrift.Formats.Classic;

/// <summary>
/// Parses and checks a classic header. Beyond the grammar it checks that every variable's data
/// lie inside the file: netCDF-C does not notice a truncated file, GridDrift refuses it.
/// </summary>
internal static class ClassicHeaderParser
{
    internal delegate ClassicReader Build(ClassicVariant variant, IReadOnlyList<NcDimension> dims,
        IReadOnlyList<NcAttribute> attributes, IReadOnlyList<NcVariable> variables,
        Dictionary<NcVariable, ClassicReader.VariableLayout> layouts, long numrecs, long recsize);

    sealed record RawVariable(string Name, int[] DimIds, List<NcAttribute> Attributes, NcType Type, long Begin);

    public static ClassicReader Parse(SafeFileHandle handle, string path, long fileLength, Build build)
    {
        var c = new HeaderCursor(handle, path, fileLength);
        if (fileLength < 4) throw c.Fault(fileLength == 0 ? "file is empty" : "file is too short to be NetCDF");
        var magic = c.Bytes(4);
        if (magic[0] != 'C' || magic[1] != 'D' || magic[2] != 'F' || magic[3] is not (1 or 2 or 5))
            throw c.Fault("not a NetCDF classic file (bad magic number)");
        var variant = (ClassicVariant)magic[3];
        int cw = ClassicLayout.CountWidth(variant);
        int ow = ClassicLayout.OffsetWidth(variant);

        ulong numrecsRaw = cw == 8 ? c.UInt64() : c.UInt32();
        bool streaming = cw == 8 ? numrecsRaw == ClassicLayout.Streaming64 : numrecsRaw == ClassicLayout.Streaming32;
        if (!streaming && numrecsRaw > long.MaxValue) throw c.Fault($"record count {numrecsRaw} is out of range");

        // dim_list
        var dimNames = new List<string>();
        var dimLengths = new List<long>();
        int unlimitedId = -1;
        long dimCount = ListHeader(c, cw, ClassicLayout.TagDimension, "dimension", 2 * cw);
        for (long i = 0; i < dimCount; i++)
        {
            string name = c.Name(cw, "dimension");
            long length = c.Count(cw, $"dimension '{name}' length");
            if (length == 0)
            {
                if (unlimitedId >= 0) throw c.Fault($"dimension '{name}' is a second unlimited dimension");
                unlimitedId = (int)i;
            }
            dimNames.Add(name);
            dimLengths.Add(length);
        }

        var globals = AttributeList(c, cw, variant, null);

        long varCount = ListHeader(c, cw, ClassicLayout.TagVariable, "variable", 3 * cw + 4 + ow);
        var raws = new List<RawVariable>();
        for (long i = 0; i < varCount; i++)
        {
            string name = c.Name(cw, "variable");
            long rank = c.Count(cw, $"variable '{name}' rank");
            if (rank > c.Remaining / cw) throw c.Fault($"variable '{name}' claims {rank} dimensions");
            var ids = new int[rank];
            for (int d = 0; d < rank; d++)
            {
                long id = c.Count(cw, $"variable '{name}' dimension id");
                if (id >= dimNames.Count) throw c.Fault($"variable '{name}' names dimension id {id}; the file has {dimNames.Count}");
                if (id == unlimitedId && d != 0) throw c.Fault($"variable '{name}' uses the unlimited dimension other than first");
                ids[d] = (int)id;
            }
            var attrs = AttributeList(c, cw, variant, name);
            var type = TypeCode(c, variant, $"variable '{name}'");
            c.Count(cw, $"variable '{name}' vsize"); // recomputed from the shape: the stored value saturates for large variables
            long begin = ow == 8 ? c.Count(8, $"variable '{name}' offset") : c.UInt32();
            raws.Add(new RawVariable(name, ids, attrs, type, begin));
        }
        long headerEnd = c.Position;

        return Assemble(path, fileLength, variant, dimNames, dimLengths, unlimitedId, streaming,
            (long)(streaming ? 0 : numrecsRaw), globals, raws, headerEnd, build);
    }

    static ClassicReader Assemble(string path, long fileLength, ClassicVariant variant, List<string> dimNames,
        List<long> dimLengths, int unlimitedId, bool streaming, long numrecs, List<NcAttribute> globals,
        List<RawVariable> raws, long headerEnd, Build build)
    {
        BadInputException Fault(string? variable, string message) => new(path, variable, message);

        // Record size: per-record slabs padded to 4 bytes, except when there is one record variable.
        var slabs = new long[raws.Count];
        long recordSize = 0;
        int recordVariables = 0;
        long firstRecordBegin = long.MaxValue;
        for (int i = 0; i < raws.Count; i++)
        {
            var r = raws[i];
            long elements = 1;
            try
            {
                foreach (var id in r.DimIds)
                    if (id != unlimitedId) elements = checked(elements * dimLengths[id]);
                slabs[i] = checked(elements * NcTypes.SizeOf(r.Type));
            }
            catch (OverflowException)
            {
                throw Fault(r.Name, "declares more elements than any file can hold");
            }
            if (r.DimIds.Length > 0 && r.DimIds[0] == unlimitedId)
            {
                recordVariables++;
                recordSize = checked(recordSize + ClassicLayout.Pad4(slabs[i]));
                firstRecordBegin = Math.Min(firstRecordBegin, r.Begin);
            }
        }
        if (recordVariables == 1)
            for (int i = 0; i < raws.Count; i++)
                if (raws[i].DimIds.Length > 0 && raws[i].DimIds[0] == unlimitedId) recordSize = slabs[i];

        if (streaming)
            numrecs = recordVariables == 0 || recordSize == 0 || firstRecordBegin > fileLength
                ? 0 : (fileLength - firstRecordBegin) / recordSize;

        var dims = new NcDimension[dimNames.Count];
        for (int i = 0; i < dims.Length; i++)
            dims[i] = i == unlimitedId ? new NcDimension(dimNames[i], numrecs, true) : new NcDimension(dimNames[i], dimLengths[i], false);

        var variables = new List<NcVariable>(raws.Count);
        var layouts = new Dictionary<NcVariable, ClassicReader.VariableLayout>(ReferenceEqualityComparer.Instance);
        for (int i = 0; i < raws.Count; i++)
        {
            var r = raws[i];
            bool isRecord = r.DimIds.Length > 0 && r.DimIds[0] == unlimitedId;
            if (r.Begin < headerEnd)
                throw Fault(r.Name, $"data offset {r.Begin} lies inside the header (which ends at byte {headerEnd})");
            if (r.Begin % 4 != 0) throw Fault(r.Name, $"data offset {r.Begin} is not on a 4-byte boundary, where the netCDF library puts every variable's data");
            long extent = isRecord
                ? (numrecs == 0 ? 0 : r.Begin + (numrecs - 1) * recordSize + slabs[i])
                : r.Begin + slabs[i];
            if (extent > fileLength || extent < 0)
                throw Fault(r.Name, $"data end at byte {extent}, but the file has only {fileLength} bytes (truncated file)");

            var vdims = r.DimIds.Select(id => dims[id]).ToArray();
            var inner = vdims.Skip(isRecord ? 1 : 0).Select(d => d.Length).ToArray();
            var variable = new NcVariable(r.Name, r.Type, vdims, r.Attributes);
            variables.Add(variable);
            layouts[variable] = new ClassicReader.VariableLayout(r.Begin, inner, isRecord, slabs[i]);
        }
        CheckLayout(raws, slabs, unlimitedId, recordSize, Fault);
        return build(variant, dims, globals, variables, layouts, numrecs, recordSize);
    }

    /// <summary>
    /// Where the data of each variable lies, as the netCDF library lays it out (NetCDF Classic
    /// Format Specification; netCDF-C aligns every variable's begin to 4 bytes): non-record data
    /// first, in the order the variables are defined, each after the one before without overlap;
    /// then the record variables, in definition order, each record holding their slabs in turn
    /// within the record size. netCDF-C refuses a header that breaks the order or overlaps
    /// ("Unknown file format"); so does this, since values would be read from the wrong bytes.
    /// </summary>
    static void CheckLayout(List<RawVariable> raws, long[] slabs, int unlimitedId, long recordSize, Func<string?, string, BadInputException> fault)
    {
        var fixedData = new List<(long Begin, long Bytes, string Name)>();
        var recordData = new List<(long Begin, long Bytes, string Name)>();
        for (int i = 0; i < raws.Count; i++)
        {
            var r = raws[i];
            (r.DimIds.Length > 0 && r.DimIds[0] == unlimitedId ? recordData : fixedData).Add((r.Begin, slabs[i], r.Name));
        }
        static void InOrder(List<(long Begin, long Bytes, string Name)> parts, Func<string?, string, BadInputException> fault)
        {
            for (int i = 1; i < parts.Count; i++)
            {
                var (previous, part) = (parts[i - 1], parts[i]);
                if (part.Begin < previous.Begin)
                    throw fault(part.Name, $"data at byte {part.Begin} come before those of '{previous.Name}' (byte {previous.Begin}), which is defined ahead of it");
                if (part.Begin < previous.Begin + previous.Bytes)
                    throw fault(part.Name, $"data at byte {part.Begin} overlap those of '{previous.Name}' (bytes {previous.Begin} to {previous.Begin + previous.Bytes - 1})");
            }
        }
        InOrder(fixedData, fault);
        InOrder(recordData, fault);
        if (recordData.Count == 0) return;
        long fixedEnd = fixedData.Count == 0 ? 0 : fixedData[^1].Begin + fixedData[^1].Bytes;
        long first = recordData[0].Begin;
        if (first < fixedEnd) throw fault(recordData[0].Name, $"record data begin at byte {first}, before the end of the non-record data (byte {fixedEnd})");
        var last = recordData[^1];
        if (last.Begin + last.Bytes > first + recordSize)
            throw fault(last.Name, $"its slab of each record ends at byte {last.Begin + last.Bytes}, beyond the record of {recordSize} bytes that begins at byte {first}");
    }

    /// <summary>Reads a list's tag and element count: ABSENT is two zeros.</summary>
    static long ListHeader(HeaderCursor c, int cw, int tag, string what, int minimumEntryBytes)
    {
        uint actual = c.UInt32();
        long count = c.Count(cw, $"{what} count");
        if (actual == 0 && count == 0) return 0;
        if (actual != tag) throw c.Fault($"expected the {what} list (tag {tag:X2}) at byte {c.Position - 4 - cw}, found tag {actual:X}");
        if (count > c.Remaining / minimumEntryBytes)
            throw c.Fault($"header claims {count} {what}s, more than the file could hold");
        return count;
    }

    static List<NcAttribute> AttributeList(HeaderCursor c, int cw, ClassicVariant variant, string? owner)
    {
        string where = owner is null ? "global attribute" : $"attribute of '{owner}'";
        long count = ListHeader(c, cw, ClassicLayout.TagAttribute, where, 2 * cw + 4);
        var list = new List<NcAttribute>((int)count);
        for (long i = 0; i < count; i++)
        {
            string name = c.Name(cw, where);
            var type = TypeCode(c, variant, $"attribute '{name}'");
            long n = c.Count(cw, $"attribute '{name}' length");
            int size = NcTypes.SizeOf(type);
            if (n > c.Remaining / size) throw c.Fault($"attribute '{name}' claims {n} values, more than the file holds");
            long bytes = n * size;
            var raw = c.Bytes(bytes);
            list.Add(new NcAttribute(name, type, RawValues.DecodeBigEndian(type, raw)));
            c.SkipPadding(bytes);
        }
        return list;
    }

    static NcType TypeCode(HeaderCursor c, ClassicVariant variant, string what)
    {
        uint code = c.UInt32();
        int highest = variant == ClassicVariant.Cdf5 ? 11 : 6;
        if (code < 1 || code > highest) throw c.Fault($"{what} has unknown type code {code}");
        return (NcType)code;
    }

}
