using GridDrift.Formats;

namespace GridDrift.Frames;

/// <summary>
/// The open files of a record: a record of one file per image can have tens of thousands, more
/// than a process may hold open, so a file is opened when a frame of it is read and closed again
/// when the pool is full and no reader uses it (least recently used first). The record's first
/// file stays open: it is the template every grid and metadata query uses. A reader serves one
/// worker at a time: workers reading the same file at once get a reader each, so a compressed
/// file is decompressed on every core (a reader of HDF5 data takes one read at a time).
/// </summary>
internal sealed class ReaderPool(Func<int, int, (IDatasetReader Reader, NcVariable Variable)> open, int capacity = 64) : IDisposable
{
    // opened outside the pool's lock, so workers open different files at once
    sealed class Entry(Func<(IDatasetReader Reader, NcVariable Variable)> open)
    {
        public Lazy<(IDatasetReader Reader, NcVariable Variable)> Opened { get; } = new(open);
        public int Users;
        public long LastUse;
    }

    readonly object _gate = new();
    // keyed by (file, copy): copy 0 of file 0 is the template
    readonly Dictionary<(int Part, int Copy), Entry> _entries = [];
    long _clock;

    /// <summary>A reader of file <paramref name="part"/> and its variable, held until the lease is disposed.</summary>
    public Lease Rent(int part)
    {
        Entry entry;
        (int, int) key;
        lock (_gate)
        {
            int copy = 0;
            while (_entries.TryGetValue((part, copy), out var held) && held.Users > 0) copy++;
            key = (part, copy);
            if (!_entries.TryGetValue(key, out entry!))
            {
                entry = new Entry(() => open(part, copy));
                _entries[key] = entry;
            }
            entry.Users++;
            entry.LastUse = ++_clock;
            Evict(); // after taking it: the entry just added is in use
        }
        try
        {
            var (reader, variable) = entry.Opened.Value;
            return new Lease(this, key, reader, variable);
        }
        catch
        {
            // a file that cannot be opened is not kept: the next reader of it tries again and reports the fault itself
            lock (_gate)
            {
                entry.Users--;
                if (_entries.TryGetValue(key, out var same) && ReferenceEquals(same, entry)) _entries.Remove(key);
            }
            throw;
        }
    }

    void Return((int Part, int Copy) key)
    {
        lock (_gate)
        {
            if (_entries.TryGetValue(key, out var entry)) entry.Users--;
            Evict();
        }
    }

    void Evict()
    {
        while (_entries.Count > capacity)
        {
            var idle = _entries.Where(e => e.Key != (0, 0) && e.Value.Users == 0).OrderBy(e => e.Value.LastUse).Select(e => ((int, int)?)e.Key).FirstOrDefault();
            if (idle is not { } key) return;
            if (_entries[key].Opened.IsValueCreated) _entries[key].Opened.Value.Reader.Dispose();
            _entries.Remove(key);
        }
    }

    public void Dispose()
    {
        lock (_gate)
        {
            foreach (var e in _entries.Values.Where(e => e.Opened.IsValueCreated)) e.Opened.Value.Reader.Dispose();
            _entries.Clear();
        }
    }

    public readonly struct Lease(ReaderPool pool, (int Part, int Copy) key, IDatasetReader reader, NcVariable variable) : IDisposable
    {
        public IDatasetReader Reader { get; } = reader;
        public NcVariable Variable { get; } = variable;
        public void Dispose() => pool.Return(key);
    }
}
