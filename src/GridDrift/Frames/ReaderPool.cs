using GridDrift.Formats;

namespace GridDrift.Frames;

/// <summary>
/// The open files of a record: a record of one file per image can have tens of thousands, more
/// than a process may hold open, so a file is opened when a frame of it is read and closed again
/// when the pool is full and no reader uses it (least recently used first). The record's first
/// file stays open: it is the template every grid and metadata query uses.
/// </summary>
internal sealed class ReaderPool(Func<int, (IDatasetReader Reader, NcVariable Variable)> open, int capacity = 64) : IDisposable
{
    sealed class Entry(IDatasetReader reader, NcVariable variable)
    {
        public IDatasetReader Reader { get; } = reader;
        public NcVariable Variable { get; } = variable;
        public int Users;
        public long LastUse;
    }

    readonly object _gate = new();
    readonly Dictionary<int, Entry> _entries = [];
    long _clock;

    /// <summary>A reader of file <paramref name="part"/> and its variable, held until the lease is disposed.</summary>
    public Lease Rent(int part)
    {
        lock (_gate)
        {
            if (!_entries.TryGetValue(part, out var entry))
            {
                var (reader, variable) = open(part);
                entry = new Entry(reader, variable);
                _entries[part] = entry;
            }
            entry.Users++;
            entry.LastUse = ++_clock;
            Evict(); // after taking it: the entry just opened is in use
            return new Lease(this, part, entry.Reader, entry.Variable);
        }
    }

    void Return(int part)
    {
        lock (_gate)
        {
            if (_entries.TryGetValue(part, out var entry)) entry.Users--;
            Evict();
        }
    }

    void Evict()
    {
        while (_entries.Count > capacity)
        {
            var idle = _entries.Where(e => e.Key != 0 && e.Value.Users == 0).OrderBy(e => e.Value.LastUse).Select(e => (int?)e.Key).FirstOrDefault();
            if (idle is not { } key) return;
            _entries[key].Reader.Dispose();
            _entries.Remove(key);
        }
    }

    public void Dispose()
    {
        lock (_gate)
        {
            foreach (var e in _entries.Values) e.Reader.Dispose();
            _entries.Clear();
        }
    }

    public readonly struct Lease(ReaderPool pool, int part, IDatasetReader reader, NcVariable variable) : IDisposable
    {
        public IDatasetReader Reader { get; } = reader;
        public NcVariable Variable { get; } = variable;
        public void Dispose() => pool.Return(part);
    }
}
