using System.Buffers.Binary;
using System.Collections.Concurrent;
using System.Globalization;

namespace GridDrift.Formats.Grib;

/// <summary>One GRIB message as the index knows it: where it is and what it holds, values not decoded.</summary>
internal sealed record GribMessage(long Offset, int Length, int Edition, string ShortName, string VariableName, string? CfName,
    string? Units, string LevelType, double Level, DateTime Valid, string GridKey, bool Bitmap);

/// <summary>What ecCodes names a parameter (its concept keys), worked out once per parameter of a file: each takes it milliseconds.</summary>
internal sealed record GribParameter(string ShortName, string VariableName, string? CfName, string? Units);

/// <summary>A grid the messages share: its rows' latitudes and columns' longitudes in the order presented (columns west to east).</summary>
internal sealed record GribGrid(string Key, string Kind, int Rows, int Columns, double[] Latitudes, double[] Longitudes, bool ReverseColumns, string? Unreadable);

/// <summary>
/// The messages of a GRIB file (editions 1 and 2, any order, other bytes between messages
/// skipped), with the keys ecCodes decodes from each: parameter, level type and level, validity
/// time (reference time plus step) and grid. An index is built once per file and version in the
/// process, so the readers of every worker share it, and remembered between runs
/// (<see cref="GribIndexCache"/>).
/// </summary>
internal sealed class GribIndex
{
    public required IReadOnlyList<GribMessage> Messages { get; init; }
    public required IReadOnlyDictionary<string, GribGrid> Grids { get; init; }
    public required IReadOnlySet<int> Editions { get; init; }

    static readonly ConcurrentDictionary<string, Lazy<GribIndex>> Built = new(StringComparer.Ordinal);

    public static GribIndex Of(string path)
    {
        var info = new FileInfo(path);
        string key = info.FullName + "\n" + info.Length + "\n" + info.LastWriteTimeUtc.Ticks;
        var lazy = Built.GetOrAdd(key, _ => new Lazy<GribIndex>(() =>
        {
            string? folder = GridDriftSettings.Current.GribIndexFolder;
            if (GribIndexCache.Load(path, folder) is { } remembered) return remembered;
            var built = Build(path);
            GribIndexCache.Store(path, folder, built);
            return built;
        }));
        try { return lazy.Value; }
        catch
        {
            Built.TryRemove(new KeyValuePair<string, Lazy<GribIndex>>(key, lazy));
            throw;
        }
    }

    /// <summary>Whether the file starts with a GRIB message (within its first 4 KiB: bulletin headers may come first).</summary>
    public static bool LooksLikeGrib(ReadOnlySpan<byte> head) => head.IndexOf("GRIB"u8) >= 0;

    /// <summary>
    /// The messages' places from their section-0 headers alone ("GRIB", edition, total length),
    /// then each message described on every core, from its sections before the data (GRIB 2) or
    /// whole (GRIB 1), read into a pooled buffer. (A mapped file was faster to index, but ecCodes
    /// touched most of each message's pages, which the process then held: 1.15 GB of resident
    /// memory for 1000 frames of 721 × 1440.)
    /// </summary>
    internal static unsafe GribIndex Build(string path)
    {
        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        long fileLength = RandomAccess.GetLength(handle);
        var places = new List<(long Offset, int Length, int Edition)>();
        var head = new byte[16];
        var tail = new byte[4];
        long at = 0;
        while (at < fileLength)
        {
            // messages usually follow one another directly; other bytes between them are searched through
            bool adjoining = at + 16 <= fileLength && RandomAccess.Read(handle, head, at) == 16 && head.AsSpan(0, 4).SequenceEqual("GRIB"u8);
            long start = adjoining ? at : Find(handle, at, fileLength);
            if (start < 0) break;
            if (!adjoining && (start + 16 > fileLength || RandomAccess.Read(handle, head, start) < 16)) throw new InvalidDataException($"message at byte {start} is cut short");
            int edition = head[7];
            long size = edition switch
            {
                1 => (head[4] << 16) | (head[5] << 8) | head[6],
                2 => (long)BinaryPrimitives.ReadUInt64BigEndian(head.AsSpan(8)),
                _ => throw new InvalidDataException($"message at byte {start} says GRIB edition {edition}; editions 1 and 2 are read"),
            };
            if (edition == 1 && (size & 0x800000) != 0) size = Eccodes.MessageLengthAt(path, start); // over 8 MB
            if (size < 16 || start + size > fileLength || size > int.MaxValue) throw new InvalidDataException($"message at byte {start} claims {size} bytes; the file has {fileLength - start} from there");
            if (RandomAccess.Read(handle, tail, start + size - 4) < 4 || !tail.AsSpan().SequenceEqual("7777"u8)) throw new InvalidDataException($"message at byte {start} does not end in '7777' (cut or damaged)");
            places.Add((start, (int)size, edition));
            at = start + size;
        }
        if (places.Count == 0) throw new InvalidDataException("holds no GRIB message");
        // a parameter's names and a grid's coordinates are worked out once each, by the first worker
        // to meet them, at most one of the two per message so that they fall to different workers
        var grids = new ConcurrentDictionary<string, GribGrid>(StringComparer.Ordinal);
        var parameters = new ConcurrentDictionary<string, GribParameter>(StringComparer.Ordinal);
        var claimed = new ConcurrentDictionary<string, bool>(StringComparer.Ordinal);
        var described = new Described[places.Count];
        string name = Path.GetFileName(path);
        void WithMessage(int k, bool headersOnly, Action<Eccodes.Message> use)
        {
            var (offset, length, _) = places[k];
            int read = length;
            var bytes = headersOnly ? RentHeaders(handle, offset, length, out read) : RentWhole(handle, offset, length);
            try
            {
                fixed (byte* start = bytes)
                {
                    using var m = new Eccodes.Message(start, read, $"{name}, message {k + 1}", headersOnly && read < length);
                    use(m);
                }
            }
            finally { System.Buffers.ArrayPool<byte>.Shared.Return(bytes); }
        }
        try
        {
            // GRIB 1's grid type needs the whole message; GRIB 2's keys are all in the sections before the data
            Parallel.For(0, places.Count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, k => WithMessage(k, places[k].Edition == 2, m =>
            {
                var d = described[k] = Describe(m, places[k].Edition);
                if (claimed.TryAdd("parameter " + d.Identity, true)) parameters[d.Identity] = Parameter(m);
                else if (claimed.TryAdd("grid " + d.GridKey, true)) WithMessage(k, false, whole => grids[d.GridKey] = Grid(whole, d.GridKey, d.GridType));
            }));
            // a grid met only in messages that were busy with a parameter
            foreach (int k in Enumerable.Range(0, places.Count).Where(k => !grids.ContainsKey(described[k].GridKey)))
                if (claimed.TryAdd("grid " + described[k].GridKey, true)) WithMessage(k, false, m => grids[described[k].GridKey] = Grid(m, described[k].GridKey, described[k].GridType));
        }
        catch (AggregateException e) when (e.InnerExceptions.All(x => x is InvalidDataException or FormatException))
        {
            throw new InvalidDataException(e.InnerExceptions[0].Message, e.InnerExceptions[0]);
        }
        var messages = new GribMessage[places.Count];
        for (int k = 0; k < messages.Length; k++)
        {
            var (d, p) = (described[k], parameters[described[k].Identity]);
            messages[k] = new GribMessage(places[k].Offset, places[k].Length, places[k].Edition, p.ShortName, p.VariableName, p.CfName, p.Units,
                d.LevelType, d.Level, d.Valid, d.GridKey, d.Bitmap);
        }
        return new GribIndex
        {
            Messages = messages,
            Grids = new Dictionary<string, GribGrid>(grids, StringComparer.Ordinal),
            Editions = messages.Select(m => m.Edition).ToHashSet(),
        };
    }

    static byte[] RentWhole(Microsoft.Win32.SafeHandles.SafeFileHandle file, long offset, int length)
    {
        var bytes = System.Buffers.ArrayPool<byte>.Shared.Rent(length);
        if (FileRanges.TryReadFully(file, bytes.AsSpan(0, length), offset)) return bytes;
        System.Buffers.ArrayPool<byte>.Shared.Return(bytes);
        throw new InvalidDataException($"message at byte {offset} is cut short");
    }

    /// <summary>
    /// A GRIB 2 message's sections up to the data section's 5-byte header, found by walking the
    /// sections' own lengths (each starts with its length and number): a few kilobytes of a
    /// message of megabytes. The whole message where the sections do not lead to a data section.
    /// </summary>
    static byte[] RentHeaders(Microsoft.Win32.SafeHandles.SafeFileHandle file, long offset, int length, out int read)
    {
        read = Math.Min(length, 1 << 16);
        var bytes = RentWhole(file, offset, read);
        int at = 16; // after section 0
        while (true)
        {
            if (at + 5 > length - 4) break; // at "7777": no data section
            if (at + 5 > read) bytes = Extend(file, offset, bytes, ref read, Math.Min(length, Math.Max(2 * read, at + 5 + (1 << 16))));
            long sectionLength = BinaryPrimitives.ReadUInt32BigEndian(bytes.AsSpan(at));
            if (bytes[at + 4] == 7)
            {
                read = at + 5;
                return bytes;
            }
            if (sectionLength < 5 || at + sectionLength > length) break;
            at += (int)sectionLength;
        }
        return read == length ? bytes : Extend(file, offset, bytes, ref read, length);
    }

    static byte[] Extend(Microsoft.Win32.SafeHandles.SafeFileHandle file, long offset, byte[] bytes, ref int read, int wanted)
    {
        var larger = System.Buffers.ArrayPool<byte>.Shared.Rent(wanted);
        bytes.AsSpan(0, read).CopyTo(larger);
        System.Buffers.ArrayPool<byte>.Shared.Return(bytes);
        if (!FileRanges.TryReadFully(file, larger.AsSpan(read, wanted - read), offset + read))
        {
            System.Buffers.ArrayPool<byte>.Shared.Return(larger);
            throw new InvalidDataException($"message at byte {offset} is cut short");
        }
        read = wanted;
        return larger;
    }

    /// <summary>A message's own keys, before its parameter's names are known: <see cref="Identity"/> is what those names depend on.</summary>
    readonly record struct Described(string Identity, string LevelType, double Level, DateTime Valid, string GridKey, string GridType, bool Bitmap);

    static long Find(Microsoft.Win32.SafeHandles.SafeFileHandle handle, long from, long length)
    {
        var window = new byte[1 << 16];
        for (long at = from; at < length; at += window.Length - 3)
        {
            int n = RandomAccess.Read(handle, window, at);
            int found = window.AsSpan(0, n).IndexOf("GRIB"u8);
            if (found >= 0) return at + found;
            if (at + n >= length) break;
        }
        return -1;
    }

    static Described Describe(Eccodes.Message m, int edition)
    {
        // the keys a parameter's concepts depend on, cheap to read: the concepts are looked up once for each distinct set
        string identity = string.Join("|", edition, m.LongOrNull("centre"), m.LongOrNull("discipline"), m.LongOrNull("parameterCategory"), m.LongOrNull("parameterNumber"),
            m.LongOrNull("table2Version"), m.LongOrNull("indicatorOfParameter"), m.LongOrNull("typeOfFirstFixedSurface"), m.LongOrNull("indicatorOfTypeOfLevel"),
            m.LongOrNull("productDefinitionTemplateNumber"), m.LongOrNull("localDefinitionNumber"), m.LongOrNull("typeOfStatisticalProcessing"));
        string levelType = m.Text("typeOfLevel") ?? "unknown";
        double level = m.Has("level") ? m.Double("level") : 0;
        long date = m.Long("validityDate"), time = m.Long("validityTime");
        var valid = DateTime.ParseExact(date.ToString("D8", CultureInfo.InvariantCulture), "yyyyMMdd", CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal)
            .AddHours(time / 100).AddMinutes(time % 100);
        string gridType = m.Text("gridType") ?? "unknown";
        string gridKey = string.Join("|", gridType, m.LongOrNull("Ni") ?? -1, m.LongOrNull("Nj") ?? -1,
            Key(m, "latitudeOfFirstGridPointInDegrees"), Key(m, "latitudeOfLastGridPointInDegrees"),
            Key(m, "longitudeOfFirstGridPointInDegrees"), Key(m, "longitudeOfLastGridPointInDegrees"),
            m.LongOrNull("iScansNegatively"), m.LongOrNull("jScansPositively"), m.LongOrNull("jPointsAreConsecutive"));
        return new Described(identity, levelType, level, valid, gridKey, gridType, m.LongOrNull("bitmapPresent") == 1);
    }

    static GribParameter Parameter(Eccodes.Message m)
    {
        string shortName = m.Text("shortName") ?? "unknown";
        // ecCodes' cfVarName differs from the short name where that is not a name CF recommends (2t is t2m): asked only then
        string name = IsCfName(shortName) ? shortName
            : m.Text("cfVarName") is { Length: > 0 } cfVarName and not "unknown" and not "~" ? cfVarName : shortName;
        string? cfName = m.Text("cfName") is { Length: > 0 } cf and not "unknown" and not "~" ? cf : null;
        string? units = m.Text("units") is { Length: > 0 } u and not "unknown" and not "~" ? u.Replace("**", "") : null;
        // ecCodes names some water contents in kg m-2 by their liquid-water-equivalent thickness, whose CF units are metres; the
        // standard name that matches the units is the mass content itself (1 kg m-2 of water is 1 mm of it)
        if (cfName is not null && units == "kg m-2" && cfName.StartsWith("lwe_thickness_of_", StringComparison.Ordinal)) cfName = cfName["lwe_thickness_of_".Length..];
        // ecCodes' long name and parameter id are left out: each concept costs 40-70 ms of definitions the first time it is asked for
        return new GribParameter(shortName, name, cfName, units);
    }

    /// <summary>CF Conventions 1.11 §2.3: names should begin with a letter and be composed of letters, digits and underscores.</summary>
    static bool IsCfName(string name) => name.Length > 0 && char.IsAsciiLetter(name[0]) && name.All(c => char.IsAsciiLetterOrDigit(c) || c == '_');

    static string Key(Eccodes.Message m, string key) => m.Has(key) ? m.Double(key).ToString("R", CultureInfo.InvariantCulture) : "";

    static GribGrid Grid(Eccodes.Message m, string key, string gridType)
    {
        long ni = m.LongOrNull("Ni") ?? -1, nj = m.LongOrNull("Nj") ?? -1;
        string? unreadable = gridType switch
        {
            "regular_ll" or "regular_gg" => null,
            "reduced_gg" => "a reduced Gaussian grid (rows of different lengths): GridDrift reads regular latitude-longitude and regular Gaussian grids; interpolate it to a regular grid first",
            _ => $"a '{gridType}' grid: GridDrift reads regular latitude-longitude and regular Gaussian grids",
        };
        if (unreadable is null && m.LongOrNull("jPointsAreConsecutive") == 1) unreadable = "points ordered column by column (jPointsAreConsecutive = 1) are not read";
        if (unreadable is not null || ni <= 0 || nj <= 0 || ni * nj > int.MaxValue)
            return new GribGrid(key, gridType, 0, 0, [], [], false, unreadable ?? $"a grid of {ni} × {nj} points");
        // ecCodes' own geometry: every point's latitude and longitude, in the message's scanning order
        var lat = m.Doubles("latitudes");
        var lon = m.Doubles("longitudes");
        int rows = (int)nj, columns = (int)ni;
        var latitudes = Enumerable.Range(0, rows).Select(j => lat[(long)j * columns]).ToArray();
        var longitudes = Enumerable.Range(0, columns).Select(i => lon[i]).ToArray();
        bool reverse = m.LongOrNull("iScansNegatively") == 1;
        if (reverse) Array.Reverse(longitudes);
        return new GribGrid(key, gridType == "regular_ll" ? "regular latitude-longitude" : "regular Gaussian", rows, columns, latitudes, longitudes, reverse, null);
    }
}
