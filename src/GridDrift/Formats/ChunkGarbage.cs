namespace GridDrift.Formats;

/// <summary>
/// Chunk buffers that readers allocate and drop (compressed chunks, decoded copies, filter
/// outputs): the runtime collects large objects only when their budget, which grows with use,
/// runs out, and at 3712 × 3712 that held 2 GB of them. Once about 128 MB have been handed out, a
/// collection returns them; it finds few objects to trace (frames are plain arrays), so it costs
/// milliseconds against the tens of milliseconds the chunks took to decode.
/// </summary>
internal static class ChunkGarbage
{
    const long Limit = 128L << 20;
    static long _handedOut;

    public static void HandedOut(long bytes)
    {
        if (bytes < 1 << 20) return;
        if (Interlocked.Add(ref _handedOut, bytes) < Limit) return;
        Interlocked.Exchange(ref _handedOut, 0);
        GC.Collect(2, GCCollectionMode.Forced, blocking: true);
    }
}
