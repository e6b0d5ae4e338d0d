using System.Security.Cryptography;
using System.Text;

namespace GridDrift.Formats.Grib;

/// <summary>
/// GRIB indexes remembered between runs. Building one reads every message's headers through
/// ecCodes and looks up each parameter's names in ecCodes' tables (about 80 ms a parameter, and
/// a long record has hundreds of thousands of messages), while a record is usually analysed by
/// several commands in a row. One file per GRIB file in a folder (<see cref="GridDriftSettings.GribIndexFolder"/>),
/// named by the SHA-256 of its key: the file's full path and <see cref="FileStamp"/>, ecCodes'
/// version and definitions path, and this build of GridDrift (whose naming rules may change).
/// An index is used only while all of them match; failing to read or write one only means the
/// index is built.
/// </summary>
internal static class GribIndexCache
{
    const int MaxFiles = 4096;
    static readonly byte[] Magic = "GDGRIBIX"u8.ToArray();

    public static GribIndex? Load(string path, string? folder)
    {
        if (Place(path, folder) is not { } file || !File.Exists(file.Path)) return null;
        try
        {
            // the file: its key, the index, and the SHA-256 of both (a damaged file is built again, never misread)
            var bytes = File.ReadAllBytes(file.Path);
            if (bytes.Length < Magic.Length + 32 || !bytes.AsSpan(0, Magic.Length).SequenceEqual(Magic)) return null;
            var body = bytes.AsSpan(Magic.Length, bytes.Length - Magic.Length - 32);
            if (!SHA256.HashData(body).AsSpan().SequenceEqual(bytes.AsSpan(bytes.Length - 32))) return null;
            using var reader = new BinaryReader(new MemoryStream(bytes, Magic.Length, body.Length), Encoding.UTF8);
            if (reader.ReadString() != file.Key) return null;
            var index = Read(reader);
            File.SetLastAccessTimeUtc(file.Path, DateTime.UtcNow);
            return index;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or FormatException or ArgumentException or IndexOutOfRangeException)
        {
            return null; // unreadable: built again
        }
    }

    public static void Store(string path, string? folder, GribIndex index)
    {
        if (Place(path, folder) is not { } file) return;
        string temporary = file.Path + "." + Environment.ProcessId + "." + Guid.NewGuid().ToString("N") + ".part";
        try
        {
            Directory.CreateDirectory(Path.GetDirectoryName(file.Path)!);
            var body = new MemoryStream();
            using (var writer = new BinaryWriter(body, Encoding.UTF8, leaveOpen: true))
            {
                writer.Write(file.Key);
                Write(writer, index);
            }
            using (var output = File.Create(temporary))
            {
                output.Write(Magic);
                output.Write(body.GetBuffer(), 0, (int)body.Length);
                output.Write(SHA256.HashData(body.GetBuffer().AsSpan(0, (int)body.Length)));
            }
            File.Move(temporary, file.Path, overwrite: true);
            Prune(Path.GetDirectoryName(file.Path)!);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            try { File.Delete(temporary); } catch (Exception inner) when (inner is IOException or UnauthorizedAccessException) { }
        }
    }

    static (string Path, string Key)? Place(string path, string? folder)
    {
        if (folder is null) return null;
        var info = new FileInfo(path);
        if (!info.Exists) return null;
        string key = string.Join("\n", info.FullName, FileStamp.Of(info), Eccodes.Identity(), typeof(GribIndexCache).Assembly.ManifestModule.ModuleVersionId);
        string name = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(key)));
        return (Path.Combine(folder, name + ".index"), key);
    }

    /// <summary>Keeps the folder to the <see cref="MaxFiles"/> indexes used last (a test suite or a sweep over many files leaves many).</summary>
    static void Prune(string folder)
    {
        var files = new DirectoryInfo(folder).GetFiles("*.index");
        if (files.Length <= MaxFiles) return;
        foreach (var old in files.OrderBy(f => f.LastAccessTimeUtc).Take(files.Length - MaxFiles / 2))
            try { old.Delete(); } catch (Exception e) when (e is IOException or UnauthorizedAccessException) { }
    }

    static void Write(BinaryWriter w, GribIndex index)
    {
        w.Write(index.Editions.Count);
        foreach (int e in index.Editions) w.Write(e);
        w.Write(index.Grids.Count);
        foreach (var g in index.Grids.Values)
        {
            w.Write(g.Key);
            w.Write(g.Kind);
            w.Write(g.Rows);
            w.Write(g.Columns);
            Doubles(w, g.Latitudes);
            Doubles(w, g.Longitudes);
            w.Write(g.ReverseColumns);
            Text(w, g.Unreadable);
        }
        // the strings of a parameter, a level type and a grid key are shared by many messages: written once, then by number
        var strings = new Dictionary<string, int>(StringComparer.Ordinal);
        var table = new List<string>();
        int Number(string? s)
        {
            if (s is null) return -1;
            if (!strings.TryGetValue(s, out int n)) { n = table.Count; strings[s] = n; table.Add(s); }
            return n;
        }
        var rows = index.Messages.Select(m => (m, Numbers: new[] { Number(m.ShortName), Number(m.VariableName), Number(m.CfName), Number(m.Units), Number(m.LevelType), Number(m.GridKey) })).ToList();
        w.Write(table.Count);
        foreach (var s in table) w.Write(s);
        w.Write(rows.Count);
        foreach (var (m, numbers) in rows)
        {
            w.Write(m.Offset);
            w.Write(m.Length);
            w.Write(m.Edition);
            foreach (int n in numbers) w.Write(n);
            w.Write(m.Level);
            w.Write(m.Valid.Ticks);
            w.Write(m.Bitmap);
        }
    }

    static GribIndex Read(BinaryReader r)
    {
        var editions = new HashSet<int>();
        for (int k = Count(r, 4); k > 0; k--) editions.Add(r.ReadInt32());
        var grids = new Dictionary<string, GribGrid>(StringComparer.Ordinal);
        for (int k = Count(r, 16); k > 0; k--)
        {
            string key = r.ReadString(), kind = r.ReadString();
            int rows = r.ReadInt32(), columns = r.ReadInt32();
            var latitudes = Doubles(r);
            var longitudes = Doubles(r);
            grids[key] = new GribGrid(key, kind, rows, columns, latitudes, longitudes, r.ReadBoolean(), Text(r));
        }
        var table = new string[Count(r, 1)];
        for (int k = 0; k < table.Length; k++) table[k] = r.ReadString();
        string? At(int n) => n < 0 ? null : table[n];
        var messages = new GribMessage[Count(r, 53)];
        for (int k = 0; k < messages.Length; k++)
        {
            long offset = r.ReadInt64();
            int length = r.ReadInt32(), edition = r.ReadInt32();
            string shortName = At(r.ReadInt32())!, variable = At(r.ReadInt32())!;
            string? cfName = At(r.ReadInt32()), units = At(r.ReadInt32());
            string levelType = At(r.ReadInt32())!, gridKey = At(r.ReadInt32())!;
            messages[k] = new GribMessage(offset, length, edition, shortName, variable, cfName, units, levelType, r.ReadDouble(), new DateTime(r.ReadInt64(), DateTimeKind.Utc), gridKey, r.ReadBoolean());
        }
        if (messages.Any(m => m.ShortName is null || m.VariableName is null || m.LevelType is null || !grids.ContainsKey(m.GridKey))) throw new FormatException("incomplete index");
        return new GribIndex { Messages = messages, Grids = grids, Editions = editions };
    }

    static void Doubles(BinaryWriter w, double[] values)
    {
        w.Write(values.Length);
        foreach (double v in values) w.Write(v);
    }

    static double[] Doubles(BinaryReader r)
    {
        var values = new double[Count(r, 8)];
        for (int k = 0; k < values.Length; k++) values[k] = r.ReadDouble();
        return values;
    }

    /// <summary>A count of items of at least <paramref name="bytes"/> each, refused when the rest of the file cannot hold them (a damaged file).</summary>
    static int Count(BinaryReader r, int bytes)
    {
        int n = r.ReadInt32();
        if (n < 0 || (long)n * bytes > r.BaseStream.Length - r.BaseStream.Position) throw new FormatException("count beyond the file");
        return n;
    }

    static void Text(BinaryWriter w, string? s)
    {
        w.Write(s is not null);
        if (s is not null) w.Write(s);
    }

    static string? Text(BinaryReader r) => r.ReadBoolean() ? r.ReadString() : null;
}
