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
/// process, so the readers of every worker share it.
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
        var lazy = Built.GetOrAdd(key, _ => new Lazy<GribIndex>(() => Build(path)));
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
    /// then each message read into a pooled buffer and described, on every core. (A mapped file
    /// was faster to index, but ecCodes touched most of each message's pages, which the process
    /// then held: 1.15 GB of resident memory for 1000 frames of 721 × 1440.)
    /// </summary>
    static unsafe GribIndex Build(string path)
    {
        using var handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        long fileLength = RandomAccess.GetLength(handle);
        var places = new List<(long Offset, int Length, int Edition)>();
        var head = new byte[16];
        var tail = new byte[4];
        long at = 0;
        while (at < fileLength)
        {
            long start = Find(handle, at, fileLength);
            if (start < 0) break;
            if (start + 16 > fileLength || RandomAccess.Read(handle, head, start) < 16) throw new InvalidDataException($"message at byte {start} is cut short");
            int edition = head[7];
            long size = edition switch
            {
                1 => (head[4] << 16) | (head[5] << 8) | head[6],
                2 => (long)BinaryPrimitives.ReadUInt64BigEndian(head.AsSpan(8)),
                _ => throw new InvalidDataException($"message at byte {start} says GRIB edition {edition}; editions 1 and 2 are read"),
            };
            if (edition == 1 && (size & 0x800000) != 0) throw new InvalidDataException($"message at byte {start} is a GRIB 1 message over 8 MB (the large-message length coding is not read)");
            if (size < 16 || start + size > fileLength || size > int.MaxValue) throw new InvalidDataException($"message at byte {start} claims {size} bytes; the file has {fileLength - start} from there");
            if (RandomAccess.Read(handle, tail, start + size - 4) < 4 || !tail.AsSpan().SequenceEqual("7777"u8)) throw new InvalidDataException($"message at byte {start} does not end in '7777' (cut or damaged)");
            places.Add((start, (int)size, edition));
            at = start + size;
        }
        if (places.Count == 0) throw new InvalidDataException("holds no GRIB message");
        var grids = new ConcurrentDictionary<string, Lazy<GribGrid>>(StringComparer.Ordinal);
        var parameters = new ConcurrentDictionary<string, Lazy<GribParameter>>(StringComparer.Ordinal);
        var messages = new GribMessage[places.Count];
        string name = Path.GetFileName(path);
        try
        {
            Parallel.For(0, places.Count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, k =>
            {
                var (offset, length, edition) = places[k];
                var bytes = System.Buffers.ArrayPool<byte>.Shared.Rent(length);
                try
                {
                    if (!FileRanges.TryReadFully(handle, bytes.AsSpan(0, length), offset)) throw new InvalidDataException($"message at byte {offset} is cut short");
                    fixed (byte* start = bytes)
                    {
                        using var m = new Eccodes.Message(start, length, $"{name}, message {k + 1}");
                        messages[k] = Describe(m, offset, length, edition, grids, parameters);
                    }
                }
                finally { System.Buffers.ArrayPool<byte>.Shared.Return(bytes); }
            });
        }
        catch (AggregateException e) when (e.InnerExceptions.All(x => x is InvalidDataException or FormatException))
        {
            throw new InvalidDataException(e.InnerExceptions[0].Message, e.InnerExceptions[0]);
        }
        return new GribIndex
        {
            Messages = messages,
            Grids = grids.ToDictionary(g => g.Key, g => g.Value.Value, StringComparer.Ordinal),
            Editions = messages.Select(m => m.Edition).ToHashSet(),
        };
    }

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

    static GribMessage Describe(Eccodes.Message m, long offset, int length, int edition,
        ConcurrentDictionary<string, Lazy<GribGrid>> grids, ConcurrentDictionary<string, Lazy<GribParameter>> parameters)
    {
        // the keys a parameter's concepts depend on, cheap to read: the concepts are looked up once for each distinct set
        string identity = string.Join("|", edition, m.LongOrNull("centre"), m.LongOrNull("discipline"), m.LongOrNull("parameterCategory"), m.LongOrNull("parameterNumber"),
            m.LongOrNull("table2Version"), m.LongOrNull("indicatorOfParameter"), m.LongOrNull("typeOfFirstFixedSurface"), m.LongOrNull("indicatorOfTypeOfLevel"),
            m.LongOrNull("productDefinitionTemplateNumber"), m.LongOrNull("localDefinitionNumber"), m.LongOrNull("typeOfStatisticalProcessing"));
        var parameter = parameters.GetOrAdd(identity, _ => new Lazy<GribParameter>(() => Parameter(m))).Value;
        string levelType = m.Text("typeOfLevel") ?? "unknown";
        double level = m.Has("level") ? m.Double("level") : 0;
        long date = m.Long("validityDate"), time = m.Long("validityTime");
        var valid = DateTime.ParseExact(date.ToString("D8", CultureInfo.InvariantCulture), "yyyyMMdd", CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal)
            .AddHours(time / 100).AddMinutes(time % 100);
        string gridType = m.Text("gridType") ?? "unknown";
        long ni = m.LongOrNull("Ni") ?? -1, nj = m.LongOrNull("Nj") ?? -1;
        string gridKey = string.Join("|", gridType, ni, nj,
            Key(m, "latitudeOfFirstGridPointInDegrees"), Key(m, "latitudeOfLastGridPointInDegrees"),
            Key(m, "longitudeOfFirstGridPointInDegrees"), Key(m, "longitudeOfLastGridPointInDegrees"),
            m.LongOrNull("iScansNegatively"), m.LongOrNull("jScansPositively"), m.LongOrNull("jPointsAreConsecutive"));
        _ = grids.GetOrAdd(gridKey, _ => new Lazy<GribGrid>(() => Grid(m, gridKey, gridType, ni, nj))).Value; // while this message's handle lives
        return new GribMessage(offset, length, edition, parameter.ShortName, parameter.VariableName, parameter.CfName, parameter.Units,
            levelType, level, valid, gridKey, m.LongOrNull("bitmapPresent") == 1);
    }

    static GribParameter Parameter(Eccodes.Message m)
    {
        string shortName = m.Text("shortName") ?? "unknown";
        string? cfVarName = m.Text("cfVarName");
        string name = cfVarName is { Length: > 0 } and not "unknown" and not "~" ? cfVarName : shortName;
        string? cfName = m.Text("cfName") is { Length: > 0 } cf and not "unknown" and not "~" ? cf : null;
        string? units = m.Text("units") is { Length: > 0 } u and not "unknown" and not "~" ? u.Replace("**", "") : null;
        // ecCodes names some water contents in kg m-2 by their liquid-water-equivalent thickness, whose CF units are metres; the
        // standard name that matches the units is the mass content itself (1 kg m-2 of water is 1 mm of it)
        if (cfName is not null && units == "kg m-2" && cfName.StartsWith("lwe_thickness_of_", StringComparison.Ordinal)) cfName = cfName["lwe_thickness_of_".Length..];
        // ecCodes' long name and parameter id are left out: each concept costs 50-70 ms of definitions the first time it is asked for
        return new GribParameter(shortName, name, cfName, units);
    }

    static string Key(Eccodes.Message m, string key) => m.Has(key) ? m.Double(key).ToString("R", CultureInfo.InvariantCulture) : "";

    static GribGrid Grid(Eccodes.Message m, string key, string gridType, long ni, long nj)
    {
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
