using System.Runtime.InteropServices;

namespace GridDrift.Formats.Grib;

/// <summary>
/// A GRIB file (editions 1 and 2) in the netCDF data model, decoded by ecCodes. Messages become
/// variables by parameter and level type (named by ecCodes' cfVarName, else its shortName; a
/// level type added to the name where one parameter comes on several); a variable's messages at
/// several levels make a level dimension named after the level type (a vertical axis, so
/// --level works as for NetCDF), and a single vertical level a scalar coordinate. Time is the
/// validity time, reference time plus step, in seconds since 1970 on the proleptic Gregorian
/// calendar; a (time, level) without a message is missing. CF's standard_name and units come from
/// ecCodes' cfName and units keys; points the bitmap leaves out are missing (NaN).
/// </summary>
internal sealed class GribReader : IDatasetReader
{
    static readonly HashSet<string> VerticalLevelTypes = new(StringComparer.Ordinal)
    {
        "isobaricInhPa", "isobaricInPa", "heightAboveGround", "heightAboveSea", "depthBelowLand", "depthBelowLandLayer",
        "hybrid", "theta", "potentialVorticity", "depthBelowSea", "oceanSurface", "soilLayer", "generalVertical",
    };

    sealed record DataVariable(GribGrid Grid, DateTime[] Times, double[]? Levels, Dictionary<(int Time, int Level), GribMessage> Slots);

    readonly Microsoft.Win32.SafeHandles.SafeFileHandle _file;
    readonly Dictionary<NcVariable, DataVariable> _data = new(ReferenceEqualityComparer.Instance);
    readonly Dictionary<NcVariable, double[]> _coordinates = new(ReferenceEqualityComparer.Instance);

    public string Path { get; }
    public string Format { get; }
    public IReadOnlyList<NcDimension> Dimensions { get; }
    public IReadOnlyList<NcAttribute> Attributes { get; }
    public IReadOnlyList<NcVariable> Variables { get; }

    GribReader(string path, GribIndex index, Microsoft.Win32.SafeHandles.SafeFileHandle file)
    {
        Path = path;
        _file = file;
        var editions = index.Editions.Order().ToList();
        Format = editions.Count == 1 ? $"GRIB edition {editions[0]}" : "GRIB editions " + string.Join(" and ", editions);
        Attributes = [NcAttribute.Text("source", $"GRIB edition {string.Join(" and ", editions)}, decoded by ecCodes")];
        var dims = new List<NcDimension>();
        var vars = new List<NcVariable>();
        var gridDims = new Dictionary<string, (NcDimension Lat, NcDimension Lon)>(StringComparer.Ordinal);
        var timeDims = new Dictionary<string, NcDimension>(StringComparer.Ordinal);
        var levelDims = new Dictionary<string, NcDimension>(StringComparer.Ordinal);
        var scalarLevels = new HashSet<string>(StringComparer.Ordinal);

        string Unique(string name, Func<string, bool> taken)
        {
            if (!taken(name)) return name;
            for (int k = 2; ; k++) if (!taken($"{name}_{k}")) return $"{name}_{k}";
        }

        var groups = index.Messages.GroupBy(m => (m.VariableName, m.LevelType)).ToList();
        var shared = groups.GroupBy(g => g.Key.VariableName).Where(g => g.Count() > 1).Select(g => g.Key).ToHashSet();
        foreach (var group in groups)
        {
            var messages = group.ToList();
            var first = messages[0];
            string name = shared.Contains(first.VariableName) ? $"{first.VariableName}_{first.LevelType}" : first.VariableName;
            var grid = index.Grids[first.GridKey];
            if (messages.Any(m => m.GridKey != first.GridKey))
                grid = grid with { Unreadable = "its messages lie on different grids" };
            var attributes = new List<NcAttribute>();
            if (first.Units is { } units) attributes.Add(NcAttribute.Text("units", units));
            if (first.CfName is { } cf) attributes.Add(NcAttribute.Text("standard_name", cf));
            attributes.Add(NcAttribute.Of("_FillValue", float.NaN));
            attributes.Add(NcAttribute.Text("parameter_short_name", first.ShortName));
            attributes.Add(NcAttribute.Text("level_type", first.LevelType));
            if (grid.Unreadable is { } why)
            {
                vars.Add(new NcVariable(name, NcType.Unsupported, [], attributes, why));
                continue;
            }

            var times = messages.Select(m => m.Valid).Distinct().Order().ToArray();
            string timeKey = string.Join(",", times.Select(t => t.Ticks));
            if (!timeDims.TryGetValue(timeKey, out var timeDim))
            {
                timeDim = new NcDimension(Unique("time", n => dims.Any(d => d.Name == n)), times.Length, false);
                timeDims[timeKey] = timeDim;
                dims.Add(timeDim);
                var timeVar = new NcVariable(timeDim.Name, NcType.Double, [timeDim],
                [
                    NcAttribute.Text("units", "seconds since 1970-01-01 00:00:00"), NcAttribute.Text("calendar", "proleptic_gregorian"),
                    NcAttribute.Text("standard_name", "time"), NcAttribute.Text("axis", "T"), NcAttribute.Text("long_name", "validity time"),
                ]);
                vars.Add(timeVar);
                _coordinates[timeVar] = times.Select(t => (t - DateTime.UnixEpoch).TotalSeconds).ToArray();
            }

            var levels = messages.Select(m => m.Level).Distinct().Order().ToArray();
            bool vertical = VerticalLevelTypes.Contains(first.LevelType);
            NcDimension? levelDim = null;
            if (levels.Length > 1)
            {
                if (first.LevelType is "isobaricInhPa" or "isobaricInPa") Array.Reverse(levels); // from the ground up: pressure falls
                string levelKey = first.LevelType + ":" + string.Join(",", levels);
                if (!levelDims.TryGetValue(levelKey, out levelDim))
                {
                    levelDim = new NcDimension(Unique(first.LevelType, n => dims.Any(d => d.Name == n) || vars.Any(v => v.Name == n)), levels.Length, false);
                    levelDims[levelKey] = levelDim;
                    dims.Add(levelDim);
                    var levelVar = new NcVariable(levelDim.Name, NcType.Double, [levelDim], LevelAttributes(first.LevelType));
                    vars.Add(levelVar);
                    _coordinates[levelVar] = levels;
                }
            }
            else if (vertical && scalarLevels.Add(first.LevelType + ":" + levels[0]))
            {
                string scalarName = Unique(first.LevelType, n => dims.Any(d => d.Name == n) || vars.Any(v => v.Name == n));
                var scalar = new NcVariable(scalarName, NcType.Double, [], LevelAttributes(first.LevelType));
                vars.Add(scalar);
                _coordinates[scalar] = [levels[0]];
                attributes.Add(NcAttribute.Text("coordinates", scalarName));
            }

            if (!gridDims.TryGetValue(grid.Key, out var g))
            {
                var lat = new NcDimension(Unique("latitude", n => dims.Any(d => d.Name == n)), grid.Rows, false);
                var lon = new NcDimension(Unique("longitude", n => dims.Any(d => d.Name == n)), grid.Columns, false);
                dims.Add(lat);
                dims.Add(lon);
                var latVar = new NcVariable(lat.Name, NcType.Double, [lat], [NcAttribute.Text("units", "degrees_north"), NcAttribute.Text("standard_name", "latitude"), NcAttribute.Text("axis", "Y")]);
                var lonVar = new NcVariable(lon.Name, NcType.Double, [lon], [NcAttribute.Text("units", "degrees_east"), NcAttribute.Text("standard_name", "longitude"), NcAttribute.Text("axis", "X")]);
                vars.Add(latVar);
                vars.Add(lonVar);
                _coordinates[latVar] = grid.Latitudes;
                _coordinates[lonVar] = grid.Longitudes;
                g = (lat, lon);
                gridDims[grid.Key] = g;
            }

            var slots = new Dictionary<(int, int), GribMessage>();
            foreach (var m in messages)
            {
                var slot = (Array.IndexOf(times, m.Valid), levelDim is null ? 0 : Array.IndexOf(levels, m.Level));
                if (!slots.TryAdd(slot, m))
                    throw new BadInputException(path, name, $"two messages for {m.Valid:yyyy-MM-ddTHH:mm}Z at {m.LevelType} {m.Level} (bytes {slots[slot].Offset} and {m.Offset})");
            }
            NcDimension[] vdims = levelDim is null ? [timeDim, g.Lat, g.Lon] : [timeDim, levelDim, g.Lat, g.Lon];
            var variable = new NcVariable(Unique(name, n => vars.Any(v => v.Name == n)), NcType.Float, vdims, attributes);
            vars.Add(variable);
            _data[variable] = new DataVariable(grid, times, levelDim is null ? null : levels, slots);
        }
        Dimensions = dims;
        Variables = vars;
    }

    static List<NcAttribute> LevelAttributes(string levelType)
    {
        var list = new List<NcAttribute> { NcAttribute.Text("long_name", levelType), NcAttribute.Text("axis", "Z") };
        switch (levelType)
        {
            case "isobaricInhPa": list.AddRange([NcAttribute.Text("units", "hPa"), NcAttribute.Text("standard_name", "air_pressure"), NcAttribute.Text("positive", "down")]); break;
            case "isobaricInPa": list.AddRange([NcAttribute.Text("units", "Pa"), NcAttribute.Text("standard_name", "air_pressure"), NcAttribute.Text("positive", "down")]); break;
            case "heightAboveGround" or "heightAboveSea": list.AddRange([NcAttribute.Text("units", "m"), NcAttribute.Text("positive", "up")]); break;
            case "depthBelowLand" or "depthBelowLandLayer" or "depthBelowSea": list.AddRange([NcAttribute.Text("units", "m"), NcAttribute.Text("positive", "down")]); break;
            default: list.Add(NcAttribute.Text("units", "1")); break;
        }
        return list;
    }

    public static GribReader Open(string path)
    {
        if (!Eccodes.Available) throw new BadInputException(path, null, Eccodes.Missing);
        Microsoft.Win32.SafeHandles.SafeFileHandle? file = null;
        try
        {
            var index = GribIndex.Of(path);
            file = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
            return new GribReader(path, index, file);
        }
        catch (InvalidDataException e)
        {
            file?.Dispose();
            throw new BadInputException(path, null, e.Message, e);
        }
        catch
        {
            file?.Dispose();
            throw;
        }
    }

    public string[] ReadStrings(NcVariable variable) => throw new BadInputException(Path, variable.Name, "GRIB files hold no strings");

    public void ReadRaw(NcVariable variable, ReadOnlySpan<long> start, ReadOnlySpan<long> count, Span<byte> destination)
    {
        RawValues.RequireNumeric(Path, variable);
        int size = NcTypes.SizeOf(variable.Type);
        Hyperslab.Validate(Path, variable, variable.Shape, start, count, destination.Length, size);
        if (destination.Length == 0) return;
        if (_coordinates.TryGetValue(variable, out var values))
        {
            var target = MemoryMarshal.Cast<byte, double>(destination);
            if (variable.Rank == 0) target[0] = values[0];
            else values.AsSpan((int)start[0], (int)count[0]).CopyTo(target);
            return;
        }
        var data = _data[variable];
        int rank = variable.Rank, rows = data.Grid.Rows, columns = data.Grid.Columns;
        int t0 = (int)start[0], nt = (int)count[0];
        int l0 = rank == 4 ? (int)start[1] : 0, nl = rank == 4 ? (int)count[1] : 1;
        int j0 = (int)start[rank - 2], nj = (int)count[rank - 2], i0 = (int)start[rank - 1], ni = (int)count[rank - 1];
        int frameCells = nj * ni;
        var output = MemoryMarshal.Cast<byte, float>(destination);
        unsafe
        {
            fixed (float* pinned = output)
            {
                nint address = (nint)pinned;
                int total = output.Length;
                void Frame(int k)
                {
                    int t = t0 + k / nl, l = l0 + k % nl;
                    var target = new Span<float>((void*)address, total).Slice(k * frameCells, frameCells);
                    if (!data.Slots.TryGetValue((t, l), out var message))
                    {
                        target.Fill(float.NaN);
                        return;
                    }
                    if (nj == rows && ni == columns && !data.Grid.ReverseColumns)
                    {
                        Decode(message, target);
                        return;
                    }
                    var field = System.Buffers.ArrayPool<float>.Shared.Rent(rows * columns);
                    try
                    {
                        Decode(message, field.AsSpan(0, rows * columns));
                        for (int j = 0; j < nj; j++)
                        {
                            var row = field.AsSpan((j0 + j) * columns, columns);
                            var into = target.Slice(j * ni, ni);
                            if (data.Grid.ReverseColumns)
                                for (int i = 0; i < ni; i++) into[i] = row[columns - 1 - (i0 + i)];
                            else row.Slice(i0, ni).CopyTo(into);
                        }
                    }
                    finally { System.Buffers.ArrayPool<float>.Shared.Return(field); }
                }
                try
                {
                    if (nt * nl == 1) Frame(0);
                    else Parallel.For(0, nt * nl, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, Frame);
                }
                catch (AggregateException e) when (e.InnerExceptions.All(x => x is InvalidDataException))
                {
                    throw new BadInputException(Path, variable.Name, e.InnerExceptions[0].Message, e.InnerExceptions[0]);
                }
                catch (InvalidDataException e)
                {
                    throw new BadInputException(Path, variable.Name, e.Message, e);
                }
            }
        }
    }

    /// <summary>
    /// Decodes one message into <paramref name="target"/>. The message is read into a pooled
    /// buffer rather than decoded from a mapping: a message is read once, and faulting its pages
    /// in cost more (2.4 against 1.3 ms for 1 M points here) than copying them.
    /// </summary>
    unsafe void Decode(GribMessage message, Span<float> target)
    {
        var bytes = System.Buffers.ArrayPool<byte>.Shared.Rent(message.Length);
        var scratch = System.Buffers.ArrayPool<double>.Shared.Rent(target.Length);
        try
        {
            if (!FileRanges.TryReadFully(_file, bytes.AsSpan(0, message.Length), message.Offset))
                throw new InvalidDataException($"message at byte {message.Offset} is cut short (the file changed?)");
            fixed (byte* start = bytes)
            {
                using var m = new Eccodes.Message(start, message.Length, $"message at byte {message.Offset}");
                m.Values(target, scratch, message.Bitmap);
            }
        }
        finally
        {
            System.Buffers.ArrayPool<double>.Shared.Return(scratch);
            System.Buffers.ArrayPool<byte>.Shared.Return(bytes);
        }
    }

    public void Dispose() => _file.Dispose();
}
