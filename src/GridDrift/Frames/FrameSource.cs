using System.Buffers;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Conventions.Values;
using GridDrift.Formats;

namespace GridDrift.Frames;

/// <summary>
/// One variable of a record that may be split along time over several files, seen as one
/// ordered sequence of 2-D (or n-D) frames. Files are sorted by their first time; a different
/// grid, a missing variable, a calendar change, duplicated or overlapping times are refused
/// naming both files; gaps are allowed and listed. Frames are decoded (CF masking and
/// unpacking) into float32 buffers the caller owns; reads are safe from several threads.
/// </summary>
internal sealed class FrameSource : IDisposable
{
    readonly Part[] _parts;
    readonly int[] _partStart;

    // each file's own axes: their coordinate variables belong to that file's reader
    sealed record Part(IDatasetReader Reader, NcVariable Variable, ValueCodec Codec, TimeAxis Time, int TimeDimension, VariableAxes Axes)
    {
        /// <summary>The file's frames in the selection: [First, First + Count) of its time axis.</summary>
        public int First { get; init; }
        public int Count { get; init; } = Time.Times.Length;
    }

    public string VariableName { get; }
    public IReadOnlyList<string> Files { get; }
    public IReadOnlyList<CfTime> Times { get; }
    public CfCalendar Calendar { get; }
    /// <summary>The first file's time units: products keep them.</summary>
    public TimeUnits TimeUnits { get; }
    public TimeStep? Step { get; }
    public IReadOnlyList<TimeGap> Gaps { get; }
    /// <summary>Names and lengths of the dimensions of one frame (all but time), in file order.</summary>
    public IReadOnlyList<NcDimension> FrameDimensions { get; }
    public int FrameLength { get; }
    public int FrameCount => Times.Count;
    public IReadOnlyList<string> Warnings { get; }
    /// <summary>The first file's reader and axes, for grid and metadata queries.</summary>
    public IDatasetReader Template => _parts[0].Reader;
    public VariableAxes Axes { get; }

    /// <summary>The dimensions fixed by the selection (a level, a member): each with its coordinate variable where there is one, its index and its value.</summary>
    public IReadOnlyList<FixedDimension> Fixed { get; }
    readonly int[] _fixedIndex; // per dimension of the variable: -1 free, else the index it is fixed at

    public sealed record FixedDimension(string Dimension, int Index, NcVariable? Coordinate, double? Value);

    FrameSource(string variable, Part[] parts, List<string> warnings, IReadOnlyList<FixedDimension> fixedDimensions)
    {
        VariableName = variable;
        _parts = parts;
        Fixed = fixedDimensions;
        _fixedIndex = parts[0].Variable.Dimensions.Select(d => fixedDimensions.FirstOrDefault(f => f.Dimension == d.Name)?.Index ?? -1).ToArray();
        // the earliest file is the template: its axes, not those of the file named first
        Axes = parts[0].Axes;
        Files = parts.Select(p => p.Reader.Path).ToList();
        _partStart = new int[parts.Length + 1];
        var times = new List<CfTime>();
        for (int i = 0; i < parts.Length; i++)
        {
            _partStart[i] = times.Count;
            times.AddRange(parts[i].Time.Times.Skip(parts[i].First).Take(parts[i].Count));
        }
        _partStart[^1] = times.Count;
        Times = times;
        Calendar = parts[0].Time.Calendar;
        TimeUnits = parts[0].Time.Units;
        var first = parts[0];
        FrameDimensions = first.Variable.Dimensions.Where((_, d) => d != first.TimeDimension && _fixedIndex[d] < 0).ToList();
        FrameLength = checked((int)FrameDimensions.Aggregate(1L, (n, d) => n * d.Length));
        Step = TimeStep.Infer(times);
        Gaps = TimeGap.Find(times, Step);
        Warnings = warnings;
    }

    public static FrameSource Open(IReadOnlyList<string> paths, string variable, FrameSelection? selection = null)
    {
        if (paths.Count == 0) throw new BadInputException(null, variable, "no input files");
        var parts = new List<Part>();
        var warnings = new List<string>();
        try
        {
            foreach (var path in paths)
            {
                var reader = DatasetFiles.Open(path);
                try
                {
                    var v = reader.FindVariable(variable) ?? throw new BadInputException(path, variable,
                        parts.Count > 0 ? $"missing here but present in {parts[0].Reader.Path}"
                            : "no such variable (the file has: " + string.Join(", ", reader.Variables.Select(x => x.Name)) + ")");
                    RawValues.RequireNumeric(path, v);
                    var fileAxes = VariableAxes.Discover(reader, v);
                    int timeDim = fileAxes.IndexOf(AxisRole.Time);
                    if (timeDim < 0)
                        throw new BadInputException(path, variable, "has no time dimension (no coordinate variable with time units along any of its dimensions)");
                    var time = TimeAxis.Read(reader, fileAxes.DimensionCoordinates[timeDim]!);
                    foreach (var w in time.Warnings) warnings.Add($"{path}: variable '{time.VariableName}': {w}");
                    var codec = ValueCodec.For(v);
                    foreach (var w in codec.Warnings) warnings.Add($"{path}: variable '{variable}': {w}");
                    parts.Add(new Part(reader, v, codec, time, timeDim, fileAxes));
                }
                catch (Exception e) when (e is ArithmeticException or OutOfMemoryException or IndexOutOfRangeException or InvalidOperationException)
                {
                    // numbers in a malformed file (a dimension length, a time value) that overflow or cannot be held: bad input, not a fault
                    reader.Dispose();
                    throw new BadInputException(path, variable, $"cannot be read ({e.GetType().Name}: {e.Message})", e);
                }
                catch
                {
                    reader.Dispose();
                    throw;
                }
            }
            var ordered = parts.OrderBy(p => p.Time.Times.Length == 0 ? long.MaxValue : p.Time.Times[0].Micros).ToArray();
            CheckConsistent(ordered, variable);
            var fixedDimensions = FixedBy(ordered[0], selection, variable);
            if (selection?.Period is { } period) ordered = Within(ordered, period, variable);
            return new FrameSource(variable, ordered, warnings, fixedDimensions);
        }
        catch
        {
            foreach (var p in parts) p.Reader.Dispose();
            throw;
        }
    }

    /// <summary>
    /// The dimensions the selection fixes, resolved on the earliest file (every file has the same
    /// frame dimensions and coordinates, checked before): the vertical level by value, converted
    /// into the coordinate's units, and any other non-horizontal dimension by value or index.
    /// </summary>
    static List<FixedDimension> FixedBy(Part part, FrameSelection? selection, string variable)
    {
        var result = new List<FixedDimension>();
        if (selection is null) return result;
        var v = part.Variable;
        string path = part.Reader.Path;
        if (selection.Level is { } levelText)
        {
            int d = part.Axes.IndexOf(AxisRole.Vertical);
            if (d < 0)
                throw new BadInputException(path, variable, $"--level {levelText}: the variable has no vertical coordinate (its dimensions are {string.Join(", ", v.Dimensions.Select(x => x.Name))})");
            var coordinate = part.Axes.DimensionCoordinates[d]!;
            string units = coordinate.Attributes.Text("units") ?? "1";
            var level = LevelValue.Parse(levelText);
            double target = level.Value;
            if (level.Units is { } given)
            {
                try { target = GridDrift.Conventions.Units.UnitConverter.Between(given, units).Convert(target); }
                catch (FormatException e) { throw new BadInputException(path, coordinate.Name, $"--level {levelText}: {e.Message}"); }
            }
            var values = part.Reader.ReadAllDoubles(coordinate);
            int index = Array.FindIndex(values, x => Math.Abs(x - target) <= 1e-6 * Math.Max(1, Math.Abs(target)));
            if (index < 0)
                throw new BadInputException(path, coordinate.Name, $"--level {levelText}: no such level; the levels are {string.Join(", ", values.Select(x => x.ToString("G6", System.Globalization.CultureInfo.InvariantCulture)))} {units}");
            result.Add(new FixedDimension(v.Dimensions[d].Name, index, coordinate, values[index]));
        }
        foreach (var text in selection.At ?? [])
        {
            var pick = DimensionPick.Parse(text);
            int d = v.Dimensions.ToList().FindIndex(x => x.Name == pick.Dimension);
            if (d < 0 || d == part.TimeDimension || part.Axes.DimensionRoles[d] is AxisRole.Latitude or AxisRole.Longitude or AxisRole.ProjectionX or AxisRole.ProjectionY)
                throw new BadInputException(path, variable, $"--at {text}: '{pick.Dimension}' is not one of the variable's non-horizontal, non-time dimensions ({string.Join(", ", v.Dimensions.Where((_, k) => k != part.TimeDimension).Select(x => x.Name))})");
            if (result.Any(f => f.Dimension == pick.Dimension)) throw new BadInputException(path, variable, $"--at {text}: '{pick.Dimension}' is fixed twice");
            var coordinate = part.Axes.DimensionCoordinates[d];
            double[]? values = coordinate is not null && NcTypes.IsNumeric(coordinate.Type) ? part.Reader.ReadAllDoubles(coordinate) : null;
            int index;
            if (pick.Index is { } i)
            {
                if (i >= v.Dimensions[d].Length) throw new BadInputException(path, variable, $"--at {text}: '{pick.Dimension}' has {v.Dimensions[d].Length} entries (#0 to #{v.Dimensions[d].Length - 1})");
                index = i;
            }
            else
            {
                if (values is null) throw new BadInputException(path, variable, $"--at {text}: '{pick.Dimension}' has no coordinate variable: pick by index, {pick.Dimension}#N");
                double target = pick.Value!.Value;
                index = Array.FindIndex(values, x => Math.Abs(x - target) <= 1e-6 * Math.Max(1, Math.Abs(target)));
                if (index < 0) throw new BadInputException(path, coordinate!.Name, $"--at {text}: no such value; the values are {string.Join(", ", values.Select(x => x.ToString("G6", System.Globalization.CultureInfo.InvariantCulture)))}");
            }
            result.Add(new FixedDimension(pick.Dimension, index, values is null ? null : coordinate, values?[index]));
        }
        return result;
    }

    /// <summary>Only the frames inside the window; files with none are closed. Times are sorted, so each file keeps one run.</summary>
    static Part[] Within(Part[] parts, Conventions.Time.RecordWindow window, string variable)
    {
        (CfTime? Start, CfTime? End) bounds;
        try { bounds = window.In(parts[0].Time.Calendar); }
        catch (FormatException e) { throw new BadInputException(parts[0].Reader.Path, parts[0].Time.VariableName, $"--period {window.Text}: {e.Message}"); }
        var kept = new List<Part>();
        foreach (var p in parts)
        {
            var times = p.Time.Times;
            int first = 0;
            while (first < times.Length && !window.Contains(times[first], bounds) && (bounds.Start is not { } s || times[first] < s)) first++;
            int end = first;
            while (end < times.Length && window.Contains(times[end], bounds)) end++;
            if (end > first) kept.Add(p with { First = first, Count = end - first });
        }
        foreach (var p in parts.Where(p => !kept.Any(k => ReferenceEquals(k.Reader, p.Reader)))) p.Reader.Dispose();
        if (kept.Count == 0)
        {
            var all = parts.SelectMany(p => p.Time.Times).ToList();
            throw new BadInputException(parts[0].Reader.Path, variable,
                $"no frame of the record falls in --period {window.Text} (the record runs from {all.Min().ToIsoString()} to {all.Max().ToIsoString()})");
        }
        return [.. kept];
    }

    static void CheckConsistent(Part[] parts, string variable)
    {
        var first = parts[0];
        foreach (var p in parts)
        {
            var times = p.Time.Times;
            for (int i = 1; i < times.Length; i++)
                if (times[i] <= times[i - 1])
                    throw new BadInputException(p.Reader.Path, p.Time.VariableName,
                        times[i] == times[i - 1] ? $"time {times[i].ToIsoString()} occurs twice (indices {i - 1} and {i})"
                            : $"times are not increasing ({times[i - 1].ToIsoString()} at index {i - 1}, then {times[i].ToIsoString()})");
        }
        for (int k = 1; k < parts.Length; k++)
        {
            var p = parts[k];
            if (p.Time.Calendar != first.Time.Calendar)
                throw new BadInputException(p.Reader.Path, p.Time.VariableName,
                    $"calendar {p.Time.Calendar.CfName()} differs from {first.Time.Calendar.CfName()} in {first.Reader.Path}");
            if (!SameGrid(first, p, out var why))
                throw new BadInputException(p.Reader.Path, variable, $"grid differs from {first.Reader.Path}: {why}");
            var prev = parts[k - 1];
            if (prev.Time.Times.Length > 0 && p.Time.Times.Length > 0 && p.Time.Times[0] <= prev.Time.Times[^1])
                throw new BadInputException(p.Reader.Path, p.Time.VariableName,
                    $"times {p.Time.Times[0].ToIsoString()} … overlap those of {prev.Reader.Path} (which ends {prev.Time.Times[^1].ToIsoString()})");
        }
    }

    static bool SameGrid(Part a, Part b, out string why)
    {
        var da = a.Variable.Dimensions.Where((_, d) => d != a.TimeDimension).ToArray();
        var db = b.Variable.Dimensions.Where((_, d) => d != b.TimeDimension).ToArray();
        if (a.TimeDimension != b.TimeDimension || da.Length != db.Length)
        {
            why = "different dimensions";
            return false;
        }
        for (int i = 0; i < da.Length; i++)
        {
            if (da[i].Name != db[i].Name || da[i].Length != db[i].Length)
            {
                why = $"dimension {da[i].Name} = {da[i].Length} there, {db[i].Name} = {db[i].Length} here";
                return false;
            }
            var ca = a.Reader.Variables.FirstOrDefault(v => v.Rank == 1 && v.Name == da[i].Name);
            var cb = b.Reader.Variables.FirstOrDefault(v => v.Rank == 1 && v.Name == db[i].Name);
            if (ca is not null && cb is not null && NcTypes.IsNumeric(ca.Type) && NcTypes.IsNumeric(cb.Type))
            {
                var xa = a.Reader.ReadAllDoubles(ca);
                var xb = b.Reader.ReadAllDoubles(cb);
                for (int j = 0; j < xa.Length; j++)
                    if (Math.Abs(xa[j] - xb[j]) > 1e-6 * Math.Max(1, Math.Abs(xa[j])))
                    {
                        why = $"coordinate {ca.Name}[{j}] is {xa[j]} there, {xb[j]} here";
                        return false;
                    }
            }
        }
        why = "";
        return true;
    }

    /// <summary>The file and the time index within it of global frame <paramref name="index"/>.</summary>
    public (string File, int LocalIndex) Locate(int index)
    {
        int part = PartOf(index);
        return (_parts[part].Reader.Path, index - _partStart[part] + _parts[part].First);
    }

    /// <summary>The files holding frames [first, end), in time order: what one shard of a sharded run reads.</summary>
    public IReadOnlyList<string> FilesOf(int first, int end)
    {
        if (end <= first) return [];
        int a = PartOf(Math.Max(0, first)), b = PartOf(Math.Min(FrameCount, end) - 1);
        return Enumerable.Range(a, b - a + 1).Select(p => _parts[p].Reader.Path).ToList();
    }

    int PartOf(int index)
    {
        if ((uint)index >= (uint)FrameCount) throw new ArgumentOutOfRangeException(nameof(index));
        int lo = 0, hi = _parts.Length - 1;
        while (lo < hi)
        {
            int mid = (lo + hi + 1) / 2;
            if (_partStart[mid] <= index) lo = mid; else hi = mid - 1;
        }
        return lo;
    }

    GridDrift.Conventions.Units.UnitConverter? _convert;

    /// <summary>The units frames are delivered in: the variable's own, or those of <see cref="ConvertUnits"/>.</summary>
    public string Units => _convert?.To.Text ?? (Template.RequireVariable(VariableName).Attributes.Text("units") ?? "1");

    /// <summary>Delivers every frame in <paramref name="units"/> (e.g. `--units degC` for a field in K); refuses units of another dimension.</summary>
    public void ConvertUnits(string units)
    {
        string from = Template.RequireVariable(VariableName).Attributes.Text("units") ?? "1";
        try
        {
            var c = GridDrift.Conventions.Units.UnitConverter.Between(from, units);
            _convert = c.Scale == 1 && c.Offset == 0 ? null : c;
            if (_convert is null && from != units) _convert = c; // keep the requested spelling for the product
        }
        catch (FormatException e)
        {
            throw new BadInputException(Files[0], VariableName, "--units: " + e.Message);
        }
    }

    /// <summary>
    /// The record's frames mapped rather than read, where every file stores them contiguously as
    /// float32 whose decoding is at most one fill value, and no unit conversion applies (the
    /// NetCDF classic formats, the common case of a long record); null otherwise, and the caller
    /// reads frames with <see cref="ReadFrame"/>. The mapped values equal ReadFrame's.
    /// </summary>
    public MappedFrames? TryMap()
    {
        if (_convert is not null || Fixed.Count > 0) return null;
        var pieces = new MappedFrames.Piece[_parts.Length];
        float? shared = null;
        for (int p = 0; p < _parts.Length; p++)
        {
            var part = _parts[p];
            if (part.Variable.Type != NcType.Float || !part.Codec.TrySingleFill(out float fill)) return null;
            if (shared is { } f && BitConverter.SingleToInt32Bits(f) != BitConverter.SingleToInt32Bits(fill)) return null;
            shared = fill;
            if (part.Reader is not IStoredFrameLayout layout || layout.LocateFrames(part.Variable, part.TimeDimension) is not { BigEndian: true } stored
                || stored.Bytes != 4L * FrameLength || stored.FrameCount < _partStart[p + 1] - _partStart[p]) return null;
            if (part.First > 0) stored = stored with { Offset = stored.Offset + part.First * stored.Stride, FrameCount = stored.FrameCount - part.First };
            pieces[p] = new MappedFrames.Piece(part.Reader.Path, stored, _partStart[p]);
        }
        return new MappedFrames(pieces, shared ?? float.NaN, VariableName);
    }

    /// <summary>Reads and decodes frame <paramref name="index"/> (physical units, NaN where missing).</summary>
    public void ReadFrame(int index, Span<float> destination)
    {
        ReadDecoded(index, destination);
        _convert?.Convert(destination);
    }

    void ReadDecoded(int index, Span<float> destination)
    {
        if (destination.Length != FrameLength) throw new ArgumentException($"frame buffer needs {FrameLength} values");
        int p = PartOf(index);
        var part = _parts[p];
        int rank = part.Variable.Rank;
        Span<long> start = stackalloc long[rank];
        Span<long> count = stackalloc long[rank];
        for (int d = 0; d < rank; d++)
        {
            if (_fixedIndex[d] >= 0) { start[d] = _fixedIndex[d]; count[d] = 1; }
            else count[d] = part.Variable.Dimensions[d].Length;
        }
        start[part.TimeDimension] = index - _partStart[p] + part.First;
        count[part.TimeDimension] = 1;

        var type = part.Variable.Type;
        if (type == NcType.Float && !part.Codec.IsPacked)
        {
            part.Reader.ReadRaw(part.Variable, start, count, System.Runtime.InteropServices.MemoryMarshal.AsBytes(destination));
            part.Codec.DecodeInPlace(destination);
            return;
        }
        int size = NcTypes.SizeOf(type);
        byte[] raw = ArrayPool<byte>.Shared.Rent(destination.Length * size);
        double[] wide = ArrayPool<double>.Shared.Rent(destination.Length);
        try
        {
            var rawSpan = raw.AsSpan(0, destination.Length * size);
            part.Reader.ReadRaw(part.Variable, start, count, rawSpan);
            var wideSpan = wide.AsSpan(0, destination.Length);
            RawValues.ToDouble(type, rawSpan, wideSpan);
            part.Codec.Decode(wideSpan, destination);
        }
        finally
        {
            ArrayPool<byte>.Shared.Return(raw);
            ArrayPool<double>.Shared.Return(wide);
        }
    }

    public void Dispose()
    {
        foreach (var p in _parts) p.Reader.Dispose();
    }
}
