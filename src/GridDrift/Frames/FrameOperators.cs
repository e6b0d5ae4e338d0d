namespace GridDrift.Frames;

/// <summary>
/// An operator over single frames. The engine makes one worker state per worker
/// (<see cref="NewWorker"/>, allocated once per run), calls <see cref="Process"/> on the workers
/// with the frame's values — one span per source the run reads at the same time index — and then
/// <see cref="Complete"/> on the calling thread in time order, where results are handed on.
/// </summary>
internal interface IFrameOperator<TWorker>
{
    TWorker NewWorker();

    void Process(TWorker worker, int frame, in FrameInputs inputs);

    void Complete(TWorker worker, int frame);
}

/// <summary>
/// An operator over pairs of frames: frame-to-frame at a lag, a frame against a fixed field, or a
/// candidate against a reference at a shared time. Same worker split as <see cref="IFrameOperator{TWorker}"/>.
/// </summary>
internal interface IPairOperator<TWorker>
{
    TWorker NewWorker();

    void Process(TWorker worker, FramePair pair, ReadOnlySpan<float> earlier, ReadOnlySpan<float> later);

    void Complete(TWorker worker, FramePair pair);
}

/// <summary>
/// An operator that takes frames a batch at a time and splits the work by cells rather than by
/// frames (a running state per cell, such as a climatology's moments, must see its frames in
/// order). The engine maps or reads the batch; the operator says in which order it wants the
/// frames (<see cref="Arrange"/>, on the calling thread) and how many pieces the cells split into,
/// and <see cref="Process{TValues}"/> runs each piece on the workers over the stored values
/// through a struct decoder, so a mapped file's pages are read once.
/// </summary>
internal interface IFrameBatchOperator
{
    /// <summary>Puts into <paramref name="order"/> the positions in <paramref name="frames"/> in the order <see cref="Process{TValues}"/> wants them.</summary>
    void Arrange(ReadOnlySpan<int> frames, Span<int> order);

    /// <summary>How many pieces the cells of one batch split into.</summary>
    int Pieces(int workers);

    /// <param name="addresses">the batch's frames in the arranged order</param>
    void Process<TValues>(int piece, ReadOnlySpan<nint> addresses, TValues values) where TValues : struct, IStoredFloats;
}

/// <summary>Two frames of a pair: indices into the earlier and the later source; −1 as <see cref="Earlier"/> means the fixed field.</summary>
internal readonly record struct FramePair(int Earlier, int Later);

/// <summary>The values of one time index in each source a frame operator reads (the first is the record's own variable).</summary>
internal readonly struct FrameInputs
{
    readonly float[][] _frames;

    internal FrameInputs(float[][] frames) => _frames = frames;

    public ReadOnlySpan<float> this[int source] => _frames[source];

    public ReadOnlySpan<float> Primary => _frames[0];

    public int Count => _frames.Length;
}
