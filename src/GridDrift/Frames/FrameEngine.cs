namespace GridDrift.Frames;

/// <summary>
/// The one frame loop of GridDrift. Every command that walks a record hands its operator to one
/// of these drivers, which own the ordering, the batching, the ring of frames a lag needs, the
/// mapped pages, the worker team, progress and cancellation. Frames in flight are bounded by the
/// worker count (and, for batches, by a byte budget), never by the length of the record; buffers
/// are made once per run, so nothing is allocated per frame.
/// </summary>
internal static class FrameEngine
{
    /// <summary>
    /// Frames <paramref name="frames"/> (indices in time order) of every source at once: frame f of
    /// sources[0], sources[1], … (a variable and its companions, e.g. humidity, temperature and
    /// pressure) read on a worker and processed there, then completed in time order.
    /// </summary>
    public static void Run<TWorker>(IReadOnlyList<FrameSource> sources, IReadOnlyList<int> frames, IFrameOperator<TWorker> op, EngineSettings settings)
    {
        if (frames.Count == 0) return;
        int workers = Math.Min(settings.WorkerCount, frames.Count);
        var states = new TWorker[workers];
        var buffers = new float[workers][][];
        for (int w = 0; w < workers; w++)
        {
            states[w] = op.NewWorker();
            buffers[w] = sources.Select(s => new float[s.FrameLength]).ToArray();
        }
        int batch = 0;
        Action<int> work = w =>
        {
            int f = frames[batch + w];
            for (int s = 0; s < sources.Count; s++) sources[s].ReadFrame(f, buffers[w][s]);
            op.Process(states[w], f, new FrameInputs(buffers[w]));
        };
        using var team = new WorkerTeam(workers);
        InBatches(frames.Count, workers, settings, (first, n) =>
        {
            batch = first;
            team.Run(n, work);
            for (int w = 0; w < n; w++) op.Complete(states[w], frames[batch + w]);
        });
    }

    /// <summary>Calls <paramref name="run"/>(first, count) for consecutive batches of at most <paramref name="size"/>, stopping when cancelled and reporting progress after each.</summary>
    static void InBatches(int total, int size, EngineSettings settings, Action<int, int> run)
    {
        for (int first = 0; first < total; first += size)
        {
            settings.Cancel.ThrowIfCancellationRequested();
            int n = Math.Min(size, total - first);
            run(first, n);
            settings.Progress?.Report((first + n, total));
        }
    }

    /// <summary>One source's frames: <see cref="Run{TWorker}(IReadOnlyList{FrameSource}, IReadOnlyList{int}, IFrameOperator{TWorker}, EngineSettings)"/> with no companions.</summary>
    public static void Run<TWorker>(FrameSource source, IReadOnlyList<int> frames, IFrameOperator<TWorker> op, EngineSettings settings) =>
        Run([source], frames, op, settings);

    /// <summary>
    /// Pairs of frames in the order given (by their later frame). When <paramref name="earlierSource"/>
    /// and <paramref name="laterSource"/> are the same record, each frame is read once into a ring
    /// that keeps the frames a later pair needs again (frame-to-frame at a lag); otherwise each
    /// worker reads its own two frames (a candidate against a reference). A pair whose earlier
    /// index is −1 uses <paramref name="fixedEarlier"/>.
    /// </summary>
    public static void RunPairs<TWorker>(FrameSource earlierSource, FrameSource laterSource, IReadOnlyList<FramePair> pairs, IPairOperator<TWorker> op,
        EngineSettings settings, float[]? fixedEarlier = null)
    {
        if (pairs.Count == 0) return;
        if (pairs.Any(p => p.Earlier < 0) && fixedEarlier is null) throw new ArgumentException("pairs against a fixed field need the field", nameof(fixedEarlier));
        int workers = Math.Min(settings.WorkerCount, pairs.Count);
        var states = new TWorker[workers];
        for (int w = 0; w < workers; w++) states[w] = op.NewWorker();
        using var team = new WorkerTeam(workers);
        if (ReferenceEquals(earlierSource, laterSource)) RingPairs(laterSource, pairs, op, settings, fixedEarlier, workers, states, team);
        else SeparatePairs(earlierSource, laterSource, pairs, op, settings, fixedEarlier, workers, states, team);
    }

    static void RingPairs<TWorker>(FrameSource source, IReadOnlyList<FramePair> pairs, IPairOperator<TWorker> op, EngineSettings settings,
        float[]? fixedEarlier, int workers, TWorker[] states, WorkerTeam team)
    {
        // enough slots that a batch's frames (at most two per pair) always fit, and that the frames
        // a lag reuses stay held until their second pair
        int lag = pairs.Where(p => p.Earlier >= 0).Select(p => p.Later - p.Earlier).DefaultIfEmpty(0).Max();
        var ring = new FrameRing(Math.Max(2 * workers, lag + workers), source.FrameLength);
        var earlierSlot = new int[workers];
        var laterSlot = new int[workers];
        var toRead = new int[2 * workers];
        var readSlot = new int[2 * workers];
        int batch = 0;
        Action<int> read = k => source.ReadFrame(toRead[k], ring.Buffer(readSlot[k]));
        Action<int> compute = w =>
        {
            var pair = pairs[batch + w];
            ReadOnlySpan<float> earlier = pair.Earlier < 0 ? fixedEarlier : ring.Buffer(earlierSlot[w]);
            op.Process(states[w], pair, earlier, ring.Buffer(laterSlot[w]));
        };
        InBatches(pairs.Count, workers, settings, (first, n) =>
        {
            batch = first;
            ring.BeginBatch();
            for (int w = 0; w < n; w++)
            {
                var p = pairs[batch + w];
                if (p.Earlier >= 0) ring.Keep(p.Earlier);
                ring.Keep(p.Later);
            }
            int reads = 0;
            for (int w = 0; w < n; w++)
            {
                var p = pairs[batch + w];
                earlierSlot[w] = p.Earlier < 0 ? -1 : ring.SlotFor(p.Earlier, toRead, readSlot, ref reads);
                laterSlot[w] = ring.SlotFor(p.Later, toRead, readSlot, ref reads);
            }
            team.Run(reads, read);
            team.Run(n, compute);
            for (int w = 0; w < n; w++) op.Complete(states[w], pairs[batch + w]);
        });
    }

    static void SeparatePairs<TWorker>(FrameSource earlierSource, FrameSource laterSource, IReadOnlyList<FramePair> pairs, IPairOperator<TWorker> op,
        EngineSettings settings, float[]? fixedEarlier, int workers, TWorker[] states, WorkerTeam team)
    {
        var a = Enumerable.Range(0, workers).Select(_ => new float[earlierSource.FrameLength]).ToArray();
        var b = Enumerable.Range(0, workers).Select(_ => new float[laterSource.FrameLength]).ToArray();
        int batch = 0;
        Action<int> work = w =>
        {
            var pair = pairs[batch + w];
            if (pair.Earlier >= 0) earlierSource.ReadFrame(pair.Earlier, a[w]);
            laterSource.ReadFrame(pair.Later, b[w]);
            op.Process(states[w], pair, pair.Earlier < 0 ? fixedEarlier : a[w], b[w]);
        };
        InBatches(pairs.Count, workers, settings, (first, n) =>
        {
            batch = first;
            team.Run(n, work);
            for (int w = 0; w < n; w++) op.Complete(states[w], pairs[batch + w]);
        });
    }

    /// <summary>Frames held at once by a batch run: enough that a slot recurs a few times within a batch, never more than 256 MiB of frames.</summary>
    public static int BatchSize(long bytesPerFrame, int workers) => (int)Math.Clamp(256L * 1024 * 1024 / bytesPerFrame, 2 * workers, 768);

    /// <summary>
    /// Frames a batch at a time, split by cells: each batch is mapped where the files allow
    /// (<see cref="FrameSource.TryMap"/>), else read in parallel into one buffer, arranged as the
    /// operator asks, and its pieces run on the workers. While <paramref name="yieldTo"/> runs
    /// (the input checksums, say) the loop leaves it a core.
    /// </summary>
    public static unsafe void RunBatches(FrameSource source, IReadOnlyList<int> frames, IFrameBatchOperator op, EngineSettings settings, Task? yieldTo = null)
    {
        if (frames.Count == 0) return;
        int workers = settings.WorkerCount;
        using var mapped = source.TryMap();
        int cells = source.FrameLength;
        // sized by the variable's own bytes: in a mapped window only its pages are touched, however many variables the records interleave
        int batchSize = Math.Min(BatchSize(4L * cells, workers), frames.Count);
        using var buffer = mapped is null ? new LargeBuffer<float>((long)batchSize * cells) : null;
        nint start0 = buffer is null ? 0 : (nint)System.Runtime.CompilerServices.Unsafe.AsPointer(ref System.Runtime.InteropServices.MemoryMarshal.GetReference(buffer.Span));
        var batchFrames = new int[batchSize];
        var order = new int[batchSize];
        var addresses = new nint[batchSize];
        int pieces = op.Pieces(workers);
        int n = 0;
        Action<int> read = k => source.ReadFrame(batchFrames[k], buffer!.Span.Slice(k * cells, cells));
        Action<int> process = mapped is null
            ? p => op.Process(p, addresses.AsSpan(0, n), new DecodedFloats())
            : p => op.Process(p, addresses.AsSpan(0, n), mapped.Decoder);
        using var team = new WorkerTeam(workers);
        InBatches(frames.Count, batchSize, settings, (first, count) =>
        {
            n = count;
            for (int k = 0; k < n; k++) batchFrames[k] = frames[first + k];
            op.Arrange(batchFrames.AsSpan(0, n), order.AsSpan(0, n));
            if (mapped is not null)
            {
                mapped.Map(batchFrames[0], batchFrames[n - 1]);
                for (int k = 0; k < n; k++) addresses[k] = (nint)mapped.Address(batchFrames[order[k]]);
            }
            else
            {
                team.Run(n, read);
                for (int k = 0; k < n; k++) addresses[k] = start0 + 4 * (nint)order[k] * cells;
            }
            team.Run(pieces, process, yieldTo is null || yieldTo.IsCompleted || workers == 1 ? workers : workers - 1);
        });
    }
}
