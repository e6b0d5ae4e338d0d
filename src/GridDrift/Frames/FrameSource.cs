using System.Buffers;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Conventions.Values;
using GridDrift.Formats;

namespace GridDrift.Frames;

/// <summary>
/// One variable of a record that may be split along time over several files, seen as one
/// ordered sequence of 2-D (or n-D) frames. A file may hold many frames along a time dimension,
/// or one image with a scalar time coordinate (CF §5.7), as satellite archives deliver them.
/// Files are sorted by their first time, given in any order; a different grid, a missing
/// variable, a calendar change, duplicated or overlapping times are refused naming both files;
/// gaps are allowed and listed. Opening reads each file's header and time only, and closes it:
/// files are opened again as their frames are read (<see cref="ReaderPool"/>), and each one's
/// horizontal coordinates are compared with the first file's when it is first read. Frames are
/// decoded (CF masking and unpacking) into float32 buffers the caller owns; reads are safe from
/// several threads.
/// </summary>
internal sealed class FrameSource : IDisposable
{
    readonly Part[] _parts;
    readonly int[] _partStart;
    readonly ReaderPool _pool;
    readonly bool[] _gridChecked;

    /// <summary>Records of up to this many files have every file's coordinates compared when opened.</summary>
    const int EagerGridChecks = 64;

    // what opening learnt of each file; its variable and axes belong to a reader since closed, except for the first file's
    sealed record Part(string Path, NcVariable Variable, ValueCodec Codec, TimeAxis Time, int TimeDimension, VariableAxes Axes)
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
    public IDatasetReader Template { get; }
    public VariableAxes Axes { get; }

    /// <summary>The dimensions fixed by the selection (a level, a member): each with its coordinate variable where there is one, its index and its value.</summary>
    public IReadOnlyList<FixedDimension> Fixed { get; }
    readonly int[] _fixedIndex; // per dimension of the variable: -1 free, else the index it is fixed at

    public sealed record FixedDimension(string Dimension, int Index, NcVariable? Coordinate, double? Value);

    FrameSource(string variable, Part[] parts, List<string> warnings, IReadOnlyList<FixedDimension> fixedDimensions, IDatasetReader template)
    {
        VariableName = variable;
        _parts = parts;
        Template = template;
        _gridChecked = new bool[parts.Length];
        if (parts.Length <= EagerGridChecks) Array.Fill(_gridChecked, true);
        _gridChecked[0] = true;
        _pool = new ReaderPool(Reopen);
        _pool.Rent(0).Dispose(); // the template's entry: it stays open
        Fixed = fixedDimensions;
        _fixedIndex = parts[0].Variable.Dimensions.Select(d => fixedDimensions.FirstOrDefault(f => f.Dimension == d.Name)?.Index ?? -1).ToArray();
        // the earliest file is the template: its axes, not those of the file named first
        Axes = parts[0].Axes;
        Files = parts.Select(p => p.Path).ToList();
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
        var parts = new List<Part>(paths.Count);
        var warnings = new List<string>();
        IDatasetReader? firstGiven = null;
        Dictionary<string, double[]>? firstCoordinates = null; // read once, compared with each of the first files
        try
        {
            foreach (var path in paths)
            {
                var reader = DatasetFiles.Open(path);
                try
                {
                    var part = Describe(reader, variable, parts.Count > 0 ? parts[0].Path : null);
                    foreach (var w in part.Time.Warnings) warnings.Add($"{path}: variable '{part.Time.VariableName}': {w}");
                    foreach (var w in part.Codec.Warnings) warnings.Add($"{path}: variable '{variable}': {w}");
                    // a short record's coordinates are compared now; a long one's as each file is first read
                    if (firstGiven is not null && parts.Count < EagerGridChecks && SameDimensions(parts[0], part, out _)
                        && !SameCoordinates(firstCoordinates ??= Coordinates(firstGiven, parts[0]), reader, part, out var why))
                        throw new BadInputException(path, variable, $"grid differs from {parts[0].Path}: {why}");
                    parts.Add(part);
                }
                finally
                {
                    if (firstGiven is null) firstGiven = reader; else reader.Dispose();
                }
            }
        }
        finally
        {
            firstGiven?.Dispose();
        }
        var ordered = parts.OrderBy(p => p.Time.Times.Length == 0 ? long.MaxValue : p.Time.Times[0].Micros).ToArray();
        CheckConsistent(ordered, variable);
        if (selection?.Period is { } period) ordered = Within(ordered, period, variable);
        // the earliest file is the template, opened again and kept open: its variable and axes must belong to the reader that serves them
        var template = DatasetFiles.Open(ordered[0].Path);
        try
        {
            var first = Describe(template, variable, null);
            ordered[0] = first with { First = ordered[0].First, Count = ordered[0].Count };
            var fixedDimensions = FixedBy(ordered[0], template, selection, variable);
            return new FrameSource(variable, ordered, warnings, fixedDimensions, template);
        }
        catch
        {
            template.Dispose();
            throw;
        }
    }

    /// <summary>What a file holds of the variable: its dimensions, decoding and times (a time dimension, or a scalar time coordinate for one image).</summary>
    static Part Describe(IDatasetReader reader, string variable, string? firstFile)
    {
        string path = reader.Path;
        try
        {
            var v = reader.FindVariable(variable) ?? throw new BadInputException(path, variable,
                firstFile is not null ? $"missing here but present in {firstFile}"
                    : "no such variable (the file has: " + string.Join(", ", reader.Variables.Select(x => x.Name)) + ")");
            RawValues.RequireNumeric(path, v);
            var fileAxes = VariableAxes.Discover(reader, v);
            int timeDim = fileAxes.IndexOf(AxisRole.Time);
            var timeVariable = timeDim >= 0 ? fileAxes.DimensionCoordinates[timeDim]! : ScalarTime(reader, v)
                ?? throw new BadInputException(path, variable, "has no time dimension and no scalar time coordinate (a variable without dimensions with units 'UNIT since DATE')");
            var time = TimeAxis.Read(reader, timeVariable);
            return new Part(path, v, ValueCodec.For(v), time, timeDim, fileAxes);
        }
        catch (Exception e) when (e is ArithmeticException or OutOfMemoryException or IndexOutOfRangeException or InvalidOperationException)
        {
            // numbers in a malformed file (a dimension length, a time value) that overflow or cannot be held: bad input, not a fault
            throw new BadInputException(path, variable, $"cannot be read ({e.GetType().Name}: {e.Message})", e);
        }
    }

    /// <summary>The scalar time coordinate of a one-image file (CF §5.7): named in the variable's coordinates attribute, else the file's only one.</summary>
    internal static NcVariable? ScalarTime(IDatasetReader reader, NcVariable data)
    {
        var candidates = reader.Variables.Where(x => x.Rank == 0 && NcTypes.IsNumeric(x.Type) && TimeUnits.LooksLikeTime(x.Attributes.Text("units"))).ToList();
        var named = (data.Attributes.Text("coordinates") ?? "").Split(' ', StringSplitOptions.RemoveEmptyEntries);
        return candidates.FirstOrDefault(c => named.Contains(c.Name)) ?? (candidates.Count == 1 ? candidates[0] : null);
    }

    /// <summary>Opens a file of the record again for reading; the first time, its horizontal coordinates are compared with the template's.</summary>
    /// <summary>Copy <paramref name="copy"/> of file <paramref name="index"/>'s reader: the first copy of the first file is the template itself.</summary>
    (IDatasetReader, NcVariable) Reopen(int index, int copy)
    {
        if (index == 0 && copy == 0) return (Template, Template.RequireVariable(VariableName));
        var part = _parts[index];
        var reader = DatasetFiles.Open(part.Path);
        try
        {
            var v = reader.FindVariable(VariableName) ?? throw new BadInputException(part.Path, VariableName, "no longer holds the variable (the file changed while the record was read)");
            if (!v.Dimensions.Select(d => (d.Name, d.Length)).SequenceEqual(part.Variable.Dimensions.Select(d => (d.Name, d.Length))))
                throw new BadInputException(part.Path, VariableName, "its dimensions changed while the record was read");
            if (!Volatile.Read(ref _gridChecked[index]))
            {
                if (!SameCoordinates(TemplateCoordinates(), reader, part, out var why))
                    throw new BadInputException(part.Path, VariableName, $"grid differs from {_parts[0].Path}: {why}");
                Volatile.Write(ref _gridChecked[index], true);
            }
            return (reader, v);
        }
        catch
        {
            reader.Dispose();
            throw;
        }
    }

    /// <summary>
    /// The dimensions the selection fixes, resolved on the earliest file (every file has the same
    /// frame dimensions and coordinates, checked before): the vertical level by value, converted
    /// into the coordinate's units, and any other non-horizontal dimension by value or index.
    /// </summary>
    static List<FixedDimension> FixedBy(Part part, IDatasetReader reader, FrameSelection? selection, string variable)
    {
        var result = new List<FixedDimension>();
        if (selection is null) return result;
        var v = part.Variable;
        string path = part.Path;
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
            var values = reader.ReadAllDoubles(coordinate);
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
            double[]? values = coordinate is not null && NcTypes.IsNumeric(coordinate.Type) ? reader.ReadAllDoubles(coordinate) : null;
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
        catch (FormatException e) { throw new BadInputException(parts[0].Path, parts[0].Time.VariableName, $"--period {window.Text}: {e.Message}"); }
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
        if (kept.Count == 0)
        {
            var all = parts.SelectMany(p => p.Time.Times).ToList();
            throw new BadInputException(parts[0].Path, variable,
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
                    throw new BadInputException(p.Path, p.Time.VariableName,
                        times[i] == times[i - 1] ? $"time {times[i].ToIsoString()} occurs twice (indices {i - 1} and {i})"
                            : $"times are not increasing ({times[i - 1].ToIsoString()} at index {i - 1}, then {times[i].ToIsoString()})");
        }
        for (int k = 1; k < parts.Length; k++)
        {
            var p = parts[k];
            if (p.Time.Calendar != first.Time.Calendar)
                throw new BadInputException(p.Path, p.Time.VariableName,
                    $"calendar {p.Time.Calendar.CfName()} differs from {first.Time.Calendar.CfName()} in {first.Path}");
            if (!SameDimensions(first, p, out var why))
                throw new BadInputException(p.Path, variable, $"grid differs from {first.Path}: {why}");
            var prev = parts[k - 1];
            if (prev.Time.Times.Length > 0 && p.Time.Times.Length > 0 && p.Time.Times[0] <= prev.Time.Times[^1])
                throw new BadInputException(p.Path, p.Time.VariableName,
                    p.Time.Times[0] == prev.Time.Times[^1] && p.Time.Times.Length == 1 && prev.Time.Times.Length == 1
                        ? $"holds the image of {p.Time.Times[0].ToIsoString()}, as {prev.Path} does"
                        : $"times {p.Time.Times[0].ToIsoString()} … overlap those of {prev.Path} (which ends {prev.Time.Times[^1].ToIsoString()})");
        }
    }

    /// <summary>The frame dimensions agree in name and length (from the headers alone).</summary>
    static bool SameDimensions(Part a, Part b, out string why)
    {
        var da = a.Variable.Dimensions.Where((_, d) => d != a.TimeDimension).ToArray();
        var db = b.Variable.Dimensions.Where((_, d) => d != b.TimeDimension).ToArray();
        if ((a.TimeDimension < 0) != (b.TimeDimension < 0) || da.Length != db.Length)
        {
            why = a.TimeDimension < 0 != b.TimeDimension < 0 ? "one file has a time dimension, the other a scalar time" : "different dimensions";
            return false;
        }
        for (int i = 0; i < da.Length; i++)
            if (da[i].Name != db[i].Name || da[i].Length != db[i].Length)
            {
                why = $"dimension {da[i].Name} = {da[i].Length} there, {db[i].Name} = {db[i].Length} here";
                return false;
            }
        why = "";
        return true;
    }

    /// <summary>The 1-D coordinate values of the frame dimensions in a file, by dimension name.</summary>
    static Dictionary<string, double[]> Coordinates(IDatasetReader reader, Part part)
    {
        var result = new Dictionary<string, double[]>();
        foreach (var dim in part.Variable.Dimensions.Where((_, d) => d != part.TimeDimension))
            if (reader.Variables.FirstOrDefault(v => v.Rank == 1 && v.Name == dim.Name) is { } c && NcTypes.IsNumeric(c.Type))
                result[dim.Name] = reader.ReadAllDoubles(c);
        return result;
    }

    Dictionary<string, double[]>? _templateCoordinates;
    Dictionary<string, double[]> TemplateCoordinates() => _templateCoordinates ??= Coordinates(Template, _parts[0]);

    /// <summary>The 1-D coordinates of the frame dimensions hold the same values (to 1e-6 relative).</summary>
    static bool SameCoordinates(Dictionary<string, double[]> reference, IDatasetReader readerB, Part b, out string why)
    {
        foreach (var (name, xa) in reference)
        {
            var cb = readerB.Variables.FirstOrDefault(v => v.Rank == 1 && v.Name == name);
            if (cb is null || !NcTypes.IsNumeric(cb.Type)) continue;
            var xb = readerB.ReadAllDoubles(cb);
            for (int j = 0; j < Math.Min(xa.Length, xb.Length); j++)
                if (Math.Abs(xa[j] - xb[j]) > 1e-6 * Math.Max(1, Math.Abs(xa[j])))
                {
                    why = $"coordinate {name}[{j}] is {xa[j]} there, {xb[j]} here";
                    return false;
                }
        }
        why = "";
        return true;
    }

    /// <summary>The file and the time index within it of global frame <paramref name="index"/>.</summary>
    public (string File, int LocalIndex) Locate(int index)
    {
        int part = PartOf(index);
        return (_parts[part].Path, index - _partStart[part] + _parts[part].First);
    }

    /// <summary>The files holding frames [first, end), in time order: what one shard of a sharded run reads.</summary>
    public IReadOnlyList<string> FilesOf(int first, int end)
    {
        if (end <= first) return [];
        int a = PartOf(Math.Max(0, first)), b = PartOf(Math.Min(FrameCount, end) - 1);
        return Enumerable.Range(a, b - a + 1).Select(p => _parts[p].Path).ToList();
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
            if (part.TimeDimension < 0) return null;
            StoredFrames? located;
            using (var lease = _pool.Rent(p))
                located = lease.Reader is IStoredFrameLayout layout ? layout.LocateFrames(lease.Variable, part.TimeDimension) : null;
            if (located is not { BigEndian: true } stored || stored.Bytes != 4L * FrameLength || stored.FrameCount < _partStart[p + 1] - _partStart[p]) return null;
            if (part.First > 0) stored = stored with { Offset = stored.Offset + part.First * stored.Stride, FrameCount = stored.FrameCount - part.First };
            pieces[p] = new MappedFrames.Piece(part.Path, stored, _partStart[p]);
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
        if (part.TimeDimension >= 0)
        {
            start[part.TimeDimension] = index - _partStart[p] + part.First;
            count[part.TimeDimension] = 1;
        }
        using var lease = _pool.Rent(p);

        var type = part.Variable.Type;
        if (type == NcType.Float && !part.Codec.IsPacked)
        {
            lease.Reader.ReadRaw(lease.Variable, start, count, System.Runtime.InteropServices.MemoryMarshal.AsBytes(destination));
            part.Codec.DecodeInPlace(destination);
            return;
        }
        int size = NcTypes.SizeOf(type);
        byte[] raw = ArrayPool<byte>.Shared.Rent(destination.Length * size);
        double[] wide = ArrayPool<double>.Shared.Rent(destination.Length);
        try
        {
            var rawSpan = raw.AsSpan(0, destination.Length * size);
            lease.Reader.ReadRaw(lease.Variable, start, count, rawSpan);
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
        _pool.Dispose();
    }
}
