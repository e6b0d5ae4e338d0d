using System.Collections.Concurrent;

namespace GridDrift.Formats.Zarr;

/// <summary>
/// Decoded chunks shared by every reader of the process: a chunk that holds several frames is
/// decoded once, by the first worker that needs it (the others wait for it), and the next chunks
/// along time are decoded ahead, one per core as far as the cache holds them, while the workers
/// use this one. Chunks stay while they are among the most recently used within 128 MB (at least
/// the last two; chunks decoded ahead and not yet read count as newest); keys include the
/// stored object's version, so a rewritten chunk is decoded afresh. A chunk's buffer is kept for
/// the next chunk of the same size once the chunk is evicted and no reader holds it (at most four
/// per size): on this machine faulting in fresh pages for every 30 MB chunk cost more than
/// decoding it. (The shared array pool rounds sizes up to a power of two and keeps arrays per
/// core, which doubled the memory held.)
/// </summary>
internal static class DecodedChunks
{
    /// <summary>The bytes of decoded chunks kept (128 MB); tests lower it to make eviction happen under load.</summary>
    internal static long Budget = 128L << 20;

    internal sealed class Entry(Action<Span<byte>> decode, int size)
    {
        public readonly int Size = size;
        public readonly Lazy<byte[]> Bytes = new(() =>
        {
            var buffer = Spare(size);
            try { decode(buffer.AsSpan(0, size)); }
            catch
            {
                Release(buffer);
                throw;
            }
            return buffer;
        }, LazyThreadSafetyMode.ExecutionAndPublication);
        public long LastUse;
        public int Users;
        public bool Evicted;
        public bool Read;
    }

    /// <summary>A reader's hold on a decoded chunk: its bytes stay valid until the lease is disposed.</summary>
    public readonly struct Lease : IDisposable
    {
        readonly Entry _entry;

        internal Lease(Entry entry) => _entry = entry;

        public ReadOnlySpan<byte> Bytes => _entry.Bytes.Value.AsSpan(0, _entry.Size);

        public void Dispose()
        {
            if (_entry is null) return; // the lease of a unit never written holds nothing
            lock (Gate)
            {
                _entry.Users--;
                if (_entry.Evicted && _entry.Users == 0) Release(_entry.Bytes.Value);
            }
        }
    }

    static readonly ConcurrentDictionary<string, Entry> Entries = new(StringComparer.Ordinal);
    static readonly object Gate = new();
    static long _clock, _held;

    /// <summary>The chunk under <paramref name="key"/>, decoded by <paramref name="decode"/> into <paramref name="size"/> bytes unless held already.</summary>
    public static Lease Get(string key, int size, Action<Span<byte>> decode)
    {
        Entry entry;
        while (true)
        {
            entry = Add(key, size, decode);
            lock (Gate)
            {
                // evicted between being found and being held: its buffer may be back in the pool, so the chunk is added afresh
                if (entry.Evicted) continue;
                entry.Users++;
                entry.LastUse = ++_clock;
                entry.Read = true;
                break;
            }
        }
        try { _ = entry.Bytes.Value; }
        catch
        {
            lock (Gate) entry.Users--;
            Forget(key, entry); // a failed decode is not remembered: the next reader reports it again
            throw;
        }
        return new Lease(entry);
    }

    /// <summary>Starts decoding a chunk on the thread pool unless it is held or under way; a fault is left for the reader that needs the chunk.</summary>
    public static void Ahead(string key, int size, Action<Span<byte>> decode)
    {
        if (Entries.ContainsKey(key)) return;
        var entry = Add(key, size, decode);
        ThreadPool.UnsafeQueueUserWorkItem(_ =>
        {
            try { _ = entry.Bytes.Value; }
            catch (Exception) { Forget(key, entry); }
        }, null);
    }

    /// <summary>Removes a chunk whose decoding failed, and its bytes from the count (it holds no buffer).</summary>
    static void Forget(string key, Entry entry)
    {
        lock (Gate)
            if (Entries.TryRemove(new KeyValuePair<string, Entry>(key, entry))) _held -= entry.Size;
    }

    static Entry Add(string key, int size, Action<Span<byte>> decode)
    {
        if (Entries.TryGetValue(key, out var held)) return held;
        // counted only by the caller whose entry went in: a value factory may run for callers that lose the race
        var fresh = new Entry(decode, size);
        var entry = Entries.GetOrAdd(key, fresh);
        if (!ReferenceEquals(entry, fresh)) return entry;
        lock (Gate)
        {
            entry.LastUse = ++_clock;
            _held += size;
            if (_held > Budget) Evict();
        }
        return entry;
    }

    /// <summary>
    /// Drops the least recently used decoded chunks beyond the budget, keeping the last two; a
    /// chunk still read returns its buffer when its last reader lets go. Chunks decoded ahead and
    /// not yet read go last: by use alone the chunk after next, queued before the current one was
    /// first read, looked oldest and was dropped just before it was wanted.
    /// </summary>
    static void Evict()
    {
        var oldest = Entries.ToArray().OrderBy(e => e.Value.Read ? 0 : 1).ThenBy(e => e.Value.LastUse).ToList(); // ToArray takes a consistent snapshot
        for (int k = 0; k < oldest.Count - 2 && _held > Budget; k++)
        {
            var (key, entry) = oldest[k];
            if (!entry.Bytes.IsValueCreated) continue; // still being decoded ahead: wanted soon
            if (!Entries.TryRemove(new KeyValuePair<string, Entry>(key, entry))) continue;
            _held -= entry.Size;
            entry.Evicted = true;
            if (entry.Users == 0 && entry.Bytes.IsValueCreated) Release(entry.Bytes.Value);
        }
    }

    /// <summary>The bytes counted as held, and the bytes of the chunks listed: equal whenever no chunk is being added.</summary>
    internal static (long Counted, long Listed) Accounting()
    {
        lock (Gate) return (_held, Entries.Values.Sum(e => (long)e.Size));
    }

    static readonly ConcurrentDictionary<int, ConcurrentStack<byte[]>> Spares = new();

    /// <summary>A buffer of exactly <paramref name="size"/> bytes: a spare one, else a new one left uninitialised (the decoder fills it).</summary>
    static byte[] Spare(int size) =>
        Spares.TryGetValue(size, out var stack) && stack.TryPop(out var buffer) ? buffer : GC.AllocateUninitializedArray<byte>(size);

    static void Release(byte[] buffer)
    {
        var stack = Spares.GetOrAdd(buffer.Length, _ => new ConcurrentStack<byte[]>());
        if (stack.Count < 4) stack.Push(buffer);
        else ChunkGarbage.HandedOut(buffer.Length);
    }
}
