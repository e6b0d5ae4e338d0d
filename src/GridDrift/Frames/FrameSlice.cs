namespace GridDrift.Frames;

/// <summary>
/// A contiguous range of a record's frames, [First, First + Count): the part of the record one
/// shard of a sharded run owns. Shard I of N owns frames ⌊(I−1)T/N⌋ up to ⌊IT/N⌋, so the N
/// slices tile the T frames without overlap and differ in length by at most one frame.
/// </summary>
internal readonly record struct FrameSlice(int First, int Count)
{
    public int End => First + Count;

    public bool Contains(int index) => index >= First && index < End;

    public static FrameSlice Whole(int frames) => new(0, frames);

    public static FrameSlice OfShard(int shard, int shards, int frames)
    {
        if (shards < 1 || shard < 1 || shard > shards) throw new ArgumentOutOfRangeException(nameof(shard), $"shard {shard} of {shards}: shards count from 1 to N");
        int first = (int)((long)(shard - 1) * frames / shards);
        int end = (int)((long)shard * frames / shards);
        return new FrameSlice(first, end - first);
    }
}
