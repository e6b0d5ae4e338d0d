using GridDrift.Conventions.Time;
using GridDrift.Frames;

namespace GridDrift.Operators.Climatology;

/// <summary>
/// Adds frames to the running moments of their climatology slot. A batch's frames are grouped by
/// slot (in time order within a slot, so the float64 update is the same whatever the batch size)
/// and each piece of the cells takes every group in turn: a cell's moments are only ever updated
/// by one worker.
/// </summary>
internal sealed class SlotAccumulator : IFrameBatchOperator
{
    readonly SlotScheme _scheme;
    readonly MomentState _state;
    readonly IReadOnlyList<CfTime> _times;
    int[] _slots = [];
    (int Slot, int Position)[] _sorted = [];
    int[] _groupStart = [];
    int _groups;
    int _chunk;

    public SlotAccumulator(SlotScheme scheme, MomentState state, IReadOnlyList<CfTime> times)
    {
        _scheme = scheme;
        _state = state;
        _times = times;
    }

    // many more pieces than workers: a worker slowed by another thread (the checksum) does not hold up the batch
    public int Pieces(int workers)
    {
        int pieces = Math.Min(_state.Cells, 16 * workers);
        _chunk = (_state.Cells + pieces - 1) / pieces;
        return pieces;
    }

    public void Arrange(ReadOnlySpan<int> frames, Span<int> order)
    {
        int n = frames.Length;
        if (_slots.Length < n)
        {
            _slots = new int[n];
            _groupStart = new int[n + 1];
            _sorted = new (int, int)[n];
        }
        // by slot, then by position: time order within a slot
        var sorted = _sorted.AsSpan(0, n);
        for (int k = 0; k < n; k++) sorted[k] = (_scheme.SlotOf(_times[frames[k]]), k);
        sorted.Sort();
        _groups = 0;
        for (int k = 0; k < n; k++)
        {
            order[k] = sorted[k].Position;
            _slots[k] = sorted[k].Slot;
            if (k == 0 || sorted[k].Slot != sorted[k - 1].Slot) _groupStart[_groups++] = k;
        }
        _groupStart[_groups] = n;
    }

    public void Process<TValues>(int piece, ReadOnlySpan<nint> addresses, TValues values) where TValues : struct, IStoredFloats
    {
        int from = piece * _chunk, length = Math.Min(_chunk, _state.Cells - from);
        if (length <= 0) return;
        for (int g = 0; g < _groups; g++)
        {
            int slot = _slots[_groupStart[g]];
            if (slot >= 0) _state.AddFrames(slot, from, length, addresses[_groupStart[g].._groupStart[g + 1]], values);
        }
    }
}
