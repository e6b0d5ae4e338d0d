using System.Buffers.Binary;
using System.Collections.Concurrent;
using System.Globalization;

namespace GridDrift.Formats.Grib;

/// <summary>One GRIB message as the index knows it: where it is and what it holds, values not decoded.</summary>
internal sealed record GribMessage(long Offset, int Length, int Edition, string ShortName, string VariableName, string? CfName, string? LongName,
    string? Units, long? ParamId, string LevelType, double Level, DateTime Valid, string GridKey);

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

    static GribIndex Build(string path)
    {
        var messages = new List<GribMessage>();
        var grids = new Dictionary<string, GribGrid>(StringComparer.Ordinal);
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        long length = stream.Length, at = 0;
        var head = new byte[16];
        while (at < length)
        {
            long start = Find(stream, at, length);
            if (start < 0) break;
            stream.Position = start;
            if (stream.ReadAtLeast(head, 16, throwOnEndOfStream: false) < 16) throw new InvalidDataException($"message at byte {start} is cut short");
            int edition = head[7];
            long size = edition switch
            {
                1 => (head[4] << 16) | (head[5] << 8) | head[6],
                2 => (long)BinaryPrimitives.ReadUInt64BigEndian(head.AsSpan(8)),
                _ => throw new InvalidDataException($"message at byte {start} says GRIB edition {edition}; editions 1 and 2 are read"),
            };
            if (edition == 1 && (size & 0x800000) != 0) throw new InvalidDataException($"message at byte {start} is a GRIB 1 message over 8 MB (the large-message length coding is not read)");
            if (size < 16 || start + size > length || size > int.MaxValue) throw new InvalidDataException($"message at byte {start} claims {size} bytes; the file has {length - start} from there");
            var bytes = new byte[size];
            stream.Position = start;
            stream.ReadExactly(bytes);
            if (!bytes.AsSpan((int)size - 4).SequenceEqual("7777"u8)) throw new InvalidDataException($"message at byte {start} does not end in '7777' (cut or damaged)");
            messages.Add(Describe(bytes, start, edition, grids, $"{Path.GetFileName(path)}, message {messages.Count + 1}"));
            at = start + size;
        }
        if (messages.Count == 0) throw new InvalidDataException("holds no GRIB message");
        return new GribIndex { Messages = messages, Grids = grids, Editions = messages.Select(m => m.Edition).ToHashSet() };
    }

    static long Find(FileStream stream, long from, long length)
    {
        var buffer = new byte[1 << 16];
        for (long at = from; at < length; at += buffer.Length - 3)
        {
            stream.Position = at;
            int n = stream.ReadAtLeast(buffer, buffer.Length, throwOnEndOfStream: false);
            int found = buffer.AsSpan(0, n).IndexOf("GRIB"u8);
            if (found >= 0) return at + found;
            if (n < buffer.Length) break;
        }
        return -1;
    }

    static GribMessage Describe(byte[] bytes, long offset, int edition, Dictionary<string, GribGrid> grids, string where)
    {
        using var m = new Eccodes.Message(bytes, where);
        string shortName = m.Text("shortName") ?? "unknown";
        string? cfVarName = m.Text("cfVarName");
        string name = cfVarName is { Length: > 0 } and not "unknown" and not "~" ? cfVarName : shortName;
        string? cfName = m.Text("cfName") is { Length: > 0 } cf and not "unknown" and not "~" ? cf : null;
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
        if (!grids.ContainsKey(gridKey)) grids[gridKey] = Grid(m, gridKey, gridType, ni, nj);
        string? units = m.Text("units") is { Length: > 0 } u and not "unknown" and not "~" ? u.Replace("**", "") : null;
        return new GribMessage(offset, bytes.Length, edition, shortName, name, cfName, m.Text("name"), units, m.LongOrNull("paramId"), levelType, level, valid, gridKey);
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
