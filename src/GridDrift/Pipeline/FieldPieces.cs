using GridDrift.Formats;
using GridDrift.Formats.Classic;

namespace GridDrift.Pipeline;

/// <summary>
/// Joins classic field files of consecutive time slices (the anomaly fields of the shards of one
/// sharded run) into one: the first piece's dimensions, variables and attributes, its fixed
/// variables (coordinates, bounds), and the records of every piece in order, copied one record
/// at a time, so memory is one frame. Pieces must have the same variables with the same shapes
/// and follow one another in time; the global attributes are the first piece's with the
/// provenance replaced.
/// </summary>
internal static class FieldPieces
{
    public static int Join(IReadOnlyList<string> pieces, string output, IReadOnlyDictionary<string, string> globals)
    {
        if (pieces.Count == 0) throw new BadInputException(null, null, "no field pieces to join");
        var readers = new List<IDatasetReader>();
        try
        {
            foreach (var p in pieces) readers.Add(DatasetFiles.Open(p));
            var first = readers[0];
            foreach (var r in readers.Skip(1))
                if (!SameLayout(first, r, out var why)) throw new BadInputException(r.Path, null, $"differs from {first.Path} ({why}): these are not pieces of one field product");
            using var w = ClassicWriter.Create(output);
            var dims = new Dictionary<string, NcDimension>();
            foreach (var d in first.Dimensions) dims[d.Name] = w.AddDimension(d.Name, d.IsUnlimited ? 0 : d.Length, d.IsUnlimited);
            foreach (var a in first.Attributes.Where(a => !globals.ContainsKey(a.Name))) w.AddAttribute(a);
            foreach (var (k, v) in globals) w.AddAttribute(NcAttribute.Global(k, v));
            var definitions = first.Variables.Select(v => (Source: v, Target: w.AddVariable(v.Name, v.Type, v.Dimensions.Select(d => dims[d.Name]), v.Attributes))).ToList();
            w.EndDefinitions();
            var buffer = new byte[definitions.Select(d => Slab(d.Source)).DefaultIfEmpty(0).Max()];
            foreach (var (source, target) in definitions.Where(d => !IsRecord(d.Source)))
            {
                var shape = source.Shape;
                first.ReadRaw(source, new long[shape.Length], shape, buffer.AsSpan(0, (int)Slab(source)));
                Write(w, target, -1, buffer.AsSpan(0, (int)Slab(source)));
            }
            long record = 0;
            double? lastTime = null;
            foreach (var r in readers)
            {
                var variables = definitions.Where(d => IsRecord(d.Source)).Select(d => (Source: r.RequireVariable(d.Source.Name), d.Target)).ToList();
                long records = variables.Count == 0 ? 0 : variables[0].Source.Dimensions[0].Length;
                var time = r.FindVariable("time");
                if (time is not null && time.Rank == 1 && records > 0)
                {
                    var t = r.ReadAllDoubles(time);
                    if (lastTime is { } l && t[0] <= l) throw new BadInputException(r.Path, "time", "does not follow the piece before it: give the pieces in time order, each once");
                    lastTime = t[^1];
                }
                for (long k = 0; k < records; k++, record++)
                    foreach (var (source, target) in variables)
                    {
                        var start = new long[source.Rank];
                        var count = source.Shape.ToArray();
                        start[0] = k;
                        count[0] = 1;
                        var slab = buffer.AsSpan(0, (int)Slab(source));
                        r.ReadRaw(source, start, count, slab);
                        Write(w, target, record, slab);
                    }
            }
            w.Commit();
            return (int)record;
        }
        finally
        {
            foreach (var r in readers) r.Dispose();
        }
    }

    static bool IsRecord(NcVariable v) => v.Rank > 0 && v.Dimensions[0].IsUnlimited;

    /// <summary>Bytes of one record of a record variable, or of the whole of a fixed one.</summary>
    static long Slab(NcVariable v) => NcTypes.SizeOf(v.Type) * v.Dimensions.Skip(IsRecord(v) ? 1 : 0).Aggregate(1L, (n, d) => n * d.Length);

    static bool SameLayout(IDatasetReader a, IDatasetReader b, out string why)
    {
        why = "";
        if (a.Variables.Count != b.Variables.Count) { why = "other variables"; return false; }
        foreach (var v in a.Variables)
        {
            var u = b.FindVariable(v.Name);
            if (u is null || u.Type != v.Type || u.Rank != v.Rank) { why = $"variable {v.Name}"; return false; }
            for (int d = IsRecord(v) ? 1 : 0; d < v.Rank; d++)
                if (u.Dimensions[d].Length != v.Dimensions[d].Length) { why = $"the shape of {v.Name}"; return false; }
        }
        return true;
    }

    /// <summary>Raw values as the reader gives them (native byte order) into the writer, typed.</summary>
    static void Write(ClassicWriter w, ClassicWriter.Definition v, long record, ReadOnlySpan<byte> raw)
    {
        switch (v.Type)
        {
            case NcType.Float: Put<float>(w, v, record, raw); break;
            case NcType.Double: Put<double>(w, v, record, raw); break;
            case NcType.Int: Put<int>(w, v, record, raw); break;
            case NcType.Short: Put<short>(w, v, record, raw); break;
            case NcType.Byte: Put<sbyte>(w, v, record, raw); break;
            case NcType.Char: Put<byte>(w, v, record, raw); break;
            default: throw new BadInputException(null, v.Name, $"joining pieces of type {NcTypes.CdlName(v.Type)} is not supported");
        }
    }

    static void Put<T>(ClassicWriter w, ClassicWriter.Definition v, long record, ReadOnlySpan<byte> raw) where T : unmanaged
    {
        var values = System.Runtime.InteropServices.MemoryMarshal.Cast<byte, T>(raw);
        if (record < 0) w.Write<T>(v, values);
        else w.WriteRecord<T>(v, record, values);
    }
}
