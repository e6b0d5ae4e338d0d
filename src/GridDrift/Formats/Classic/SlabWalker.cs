namespace GridDrift.Formats.Classic;

internal interface IRunAction
{
    /// <summary>One contiguous run: <paramref name="bytes"/> bytes at file offset and buffer offset.</summary>
    void Run(long fileOffset, int bufferOffset, int bytes);
}

/// <summary>
/// Splits a hyperslab of a classic variable into the fewest contiguous byte runs: trailing
/// dimensions taken whole merge with one partial dimension into one run; the dimensions before
/// it (and the record dimension, whose records are <c>recordSize</c> apart) are walked with an
/// odometer. Allocation-free: the action is a struct and the index lives on the stack.
/// </summary>
internal static class SlabWalker
{
    public const int MaxRank = 64;

    public static void ForEachRun<TAction>(long begin, bool isRecord, long recordSize, ReadOnlySpan<long> innerShape,
        ReadOnlySpan<long> start, ReadOnlySpan<long> count, int elementSize, ref TAction action)
        where TAction : IRunAction, allows ref struct
    {
        int rank = start.Length;
        if (rank > MaxRank) throw new ArgumentException($"rank {rank} exceeds {MaxRank}");
        for (int d = 0; d < rank; d++) if (count[d] == 0) return;
        int firstInner = isRecord ? 1 : 0;

        int split = rank;
        long runElements = 1;
        for (int d = rank - 1; d >= firstInner; d--)
        {
            runElements *= count[d];
            split = d;
            if (count[d] != innerShape[d - firstInner]) break;
        }
        if (split == rank) split = firstInner; // scalar, or a record variable with no inner dimensions
        int runBytes = checked((int)(runElements * elementSize));

        Span<long> stride = stackalloc long[rank];
        long s = 1;
        for (int d = rank - 1; d >= firstInner; d--)
        {
            stride[d] = s;
            s *= innerShape[d - firstInner];
        }
        Span<long> index = stackalloc long[rank];
        start.CopyTo(index);

        int bufferOffset = 0;
        while (true)
        {
            long element = 0;
            for (int d = firstInner; d < rank; d++) element += index[d] * stride[d];
            long offset = begin + element * elementSize + (isRecord ? index[0] * recordSize : 0);
            action.Run(offset, bufferOffset, runBytes);
            bufferOffset += runBytes;

            int k = split - 1;
            while (k >= 0)
            {
                if (++index[k] < start[k] + count[k]) break;
                index[k] = start[k];
                k--;
            }
            if (k < 0) return;
        }
    }
}
