namespace GridDrift.Frames;

/// <summary>
/// Decoded frame buffers that remember which frame each holds, so a frame that a later pair
/// needs again (frame-to-frame at a lag) is read once. Slots are handed out explicitly rather
/// than by frame index modulo the size, so pairs left out around gaps never put two frames of one
/// batch in the same slot.
/// </summary>
sealed class FrameRing
{
    readonly float[][] _buffers;
    readonly int[] _held;
    readonly bool[] _kept;
    readonly long[] _used;
    long _clock;

    public FrameRing(int slots, int frameLength)
    {
        _buffers = Enumerable.Range(0, slots).Select(_ => new float[frameLength]).ToArray();
        _held = Enumerable.Repeat(-1, slots).ToArray();
        _kept = new bool[slots];
        _used = new long[slots];
    }

    public float[] Buffer(int slot) => _buffers[slot];

    public void BeginBatch() => Array.Clear(_kept);

    /// <summary>Marks a frame this batch needs, so its slot is not given away in the batch.</summary>
    public void Keep(int frame)
    {
        int s = Array.IndexOf(_held, frame);
        if (s >= 0) _kept[s] = true;
    }

    /// <summary>The slot holding <paramref name="frame"/>; when none does, the least recently used free slot, listed for reading.</summary>
    public int SlotFor(int frame, int[] toRead, int[] readSlot, ref int reads)
    {
        _clock++;
        int s = Array.IndexOf(_held, frame);
        if (s < 0)
        {
            for (int k = 0; k < _held.Length; k++)
                if (!_kept[k] && (s < 0 || _used[k] < _used[s])) s = k;
            if (s < 0) throw new InvalidOperationException("the frame ring is smaller than a batch");
            _held[s] = frame;
            toRead[reads] = frame;
            readSlot[reads++] = s;
        }
        _kept[s] = true;
        _used[s] = _clock;
        return s;
    }
}
