using System.Collections.Concurrent;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// Decoded chunks shared by every reader of the process: a chunk that holds several frames is
/// decoded once, by the first worker that needs it, while the others wait for it, and stays while
/// it is among the most recently used within the budget (a frame's chunks are never evicted while
/// the budget holds at least two of them). Keys include the stored object's version, so a
/// rewritten chunk is decoded afresh.
/// </summary>
internal static class DecodedChunks
{
    const long Budget = 512L << 20;

    sealed class Entry(Func<byte[]> decode)
    {
        public readonly Lazy<byte[]> Bytes = new(decode, LazyThreadSafetyMode.ExecutionAndPublication);
        public long LastUse;
    }

    static readonly ConcurrentDictionary<string, Entry> Entries = new(StringComparer.Ordinal);
    static readonly object Gate = new();
    static long _clock, _held;

    public static byte[] Get(string key, int size, Func<byte[]> decode)
    {
        var entry = Entries.GetOrAdd(key, _ => new Entry(decode));
        byte[] bytes;
        try { bytes = entry.Bytes.Value; }
        catch
        {
            Entries.TryRemove(new KeyValuePair<string, Entry>(key, entry)); // a failed decode is not remembered: the next reader reports it again
            throw;
        }
        lock (Gate)
        {
            if (entry.LastUse == 0) _held += size;
            entry.LastUse = ++_clock;
            if (_held > Budget) Evict(size);
        }
        return bytes;
    }

    static void Evict(int size)
    {
        foreach (var (key, entry) in Entries.Where(e => e.Value.LastUse > 0).OrderBy(e => e.Value.LastUse).ToList())
        {
            if (_held <= Budget || _held <= 2L * size) return;
            if (Entries.TryRemove(new KeyValuePair<string, Entry>(key, entry))) _held -= entry.Bytes.IsValueCreated ? entry.Bytes.Value.Length : 0;
        }
    }
}
