
namespace GridDrift.Formats;

/// <summary>
/// Input checksums remembered between runs: hashing costs about a core-second per gigabyte,
/// and a record is usually analysed by several commands in a row. An entry is keyed by the
/// file's full path and its <see cref="FileStamp"/> (size, write time, and on Linux change time
/// and inode) and is used only while all of them still match. The cache is one appended
/// text file, $XDG_CACHE_HOME/griddrift/sha256.tsv (else ~/.cache/griddrift/sha256.tsv);
/// GRIDDRIFT_CHECKSUM_CACHE=off turns it off, and any failure to read or write it only means
/// the checksum is computed.
/// </summary>
internal static class ChecksumCache
{
    static readonly object Gate = new();
    const long MaxBytes = 2 << 20;

    public static bool Enabled => GridDriftSettings.Current.RememberChecksums;

    static string? CachePath() => GridDriftSettings.Current.ChecksumFile;

    /// <summary>Checksums of this process, by the same key: a file hashed ahead (<see cref="Prefetch"/>) or by another step is hashed once.</summary>
    static readonly System.Collections.Concurrent.ConcurrentDictionary<string, Lazy<string>> InProcess = new();

    public static string Sha256(string path)
    {
        var info = new FileInfo(path);
        if (!info.Exists) return FileHash.Sha256(path);
        string key = Path.GetFullPath(path) + "\t" + FileStamp.Of(info);
        return InProcess.GetOrAdd(key, k => new Lazy<string>(() => Compute(path, k))).Value;
    }

    /// <summary>
    /// Starts hashing <paramref name="paths"/> in the background, so a step's checksums run beside
    /// its frame loop from the start rather than after the files are opened; a later
    /// <see cref="Sha256"/> of the same file waits for this one instead of hashing again.
    /// Faults are left to that later call, which reports them.
    /// </summary>
    public static Task Prefetch(IEnumerable<string> paths) => Task.Run(() =>
    {
        foreach (var path in paths)
            try { if (File.Exists(path)) Sha256(path); }
            catch (IOException) { }
            catch (UnauthorizedAccessException) { }
    });

    static string Compute(string path, string key)
    {
        if (!Enabled) return FileHash.Sha256(path);
        string? cache = CachePath();
        if (cache is not null && Lookup(cache, key) is { } known) return known;
        string sum = FileHash.Sha256(path);
        if (cache is not null) Remember(cache, key, sum);
        return sum;
    }

    // the cache file's entries by key, read once and then only what was appended since: a record of
    // tens of thousands of one-image files looks up as many checksums, and rereading the whole file
    // for each made that quadratic
    static readonly Dictionary<string, string> Index = new(StringComparer.Ordinal);
    static string? _indexedFile;
    static long _indexedBytes;
    static long _compactedBytes;

    static string? Lookup(string cache, string key)
    {
        try
        {
            lock (Gate)
            {
                var info = new FileInfo(cache);
                if (!info.Exists) return null;
                if (_indexedFile != cache || info.Length < _indexedBytes)
                {
                    Index.Clear();
                    _indexedFile = cache;
                    _indexedBytes = 0;
                }
                if (info.Length > _indexedBytes) ReadAppended(cache);
                return Index.TryGetValue(key, out var sum) ? sum : null;
            }
        }
        catch (IOException) { return null; }
        catch (UnauthorizedAccessException) { return null; }
    }

    /// <summary>Adds the whole lines appended since the last read; a line still being written is left for the next.</summary>
    static void ReadAppended(string cache)
    {
        using var stream = new FileStream(cache, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
        stream.Position = _indexedBytes;
        var bytes = new byte[stream.Length - _indexedBytes];
        stream.ReadExactly(bytes);
        int end = Array.LastIndexOf(bytes, (byte)'\n') + 1;
        foreach (var line in System.Text.Encoding.UTF8.GetString(bytes, 0, end).Split('\n'))
            if (line.Length > 65 && line[64] == '\t') Index[line[65..]] = line[..64];
        _indexedBytes += end;
    }

    /// <summary>Keeps the newest entry of each file that still exists unchanged; written aside and renamed.</summary>
    static void Compact(string cache)
    {
        var newest = new Dictionary<string, string>();
        foreach (var line in File.ReadLines(cache))
        {
            var parts = line.Split('\t');
            if (parts.Length != 4) continue;
            var info = new FileInfo(parts[1]);
            if (info.Exists && FileStamp.Of(info) == parts[2] + "\t" + parts[3]) newest[parts[1]] = line;
        }
        string temp = cache + "." + Environment.ProcessId + ".part";
        File.WriteAllLines(temp, newest.Values);
        File.Move(temp, cache, overwrite: true);
        Index.Clear();
        _indexedBytes = 0;
        _compactedBytes = new FileInfo(cache).Length;
    }

    static void Remember(string cache, string key, string sum)
    {
        try
        {
            lock (Gate)
            {
                Directory.CreateDirectory(Path.GetDirectoryName(cache)!);
                // compacted when twice as long as the live entries it held last time: a cache of many live entries is not rewritten on every append
                if (File.Exists(cache) && new FileInfo(cache).Length > Math.Max(MaxBytes, 2 * _compactedBytes)) Compact(cache);
                // one short appended line per entry: appends of this size do not interleave between processes
                File.AppendAllText(cache, sum + "\t" + key + "\n");
            }
        }
        catch (IOException) { }
        catch (UnauthorizedAccessException) { }
    }
}
