using System.Runtime.ExceptionServices;

namespace GridDrift.Frames;

/// <summary>
/// A fixed team of threads that runs one indexed job at a time: <see cref="Run"/> calls
/// body(0 … count − 1) across the team and the calling thread, and returns when all are done.
/// The threads live for the whole run, so a record of tens of thousands of batches allocates
/// nothing per batch (a parallel loop per batch would allocate its tasks and closures each time).
/// </summary>
internal sealed class WorkerTeam : IDisposable
{
    readonly Thread[] _helpers;
    readonly SemaphoreSlim[] _start; // one per helper: each takes exactly one start per job
    readonly ManualResetEventSlim _done = new(false);
    Action<int> _body = _ => { };
    int _count, _next, _active;
    volatile bool _stopping;
    Exception? _fault;

    public WorkerTeam(int size)
    {
        int helpers = Math.Max(0, size - 1);
        _start = Enumerable.Range(0, helpers).Select(_ => new SemaphoreSlim(0)).ToArray();
        _helpers = Enumerable.Range(0, helpers).Select(h => new Thread(() => Serve(h)) { IsBackground = true, Name = $"griddrift worker {h + 1}" }).ToArray();
        foreach (var t in _helpers) t.Start();
    }

    public int Size => _helpers.Length + 1;

    /// <summary>Runs body(i) for every i below count; rethrows the first fault of any worker.</summary>
    public void Run(int count, Action<int> body) => Run(count, body, Size);

    /// <summary>
    /// <see cref="Run(int, Action{int})"/> on only <paramref name="workers"/> of the team (the
    /// calling thread and workers − 1 helpers), leaving a core to another job of the process.
    /// </summary>
    public void Run(int count, Action<int> body, int workers)
    {
        if (count <= 0) return;
        int helpers = Math.Clamp(workers - 1, 0, _helpers.Length);
        _body = body;
        _count = count;
        _next = 0;
        _fault = null;
        _active = helpers + 1;
        _done.Reset();
        for (int h = 0; h < helpers; h++) _start[h].Release();
        Drain();
        Finish();
        _done.Wait();
        if (_fault is { } fault) ExceptionDispatchInfo.Capture(fault).Throw();
    }

    void Serve(int helper)
    {
        while (true)
        {
            _start[helper].Wait();
            if (_stopping) return;
            Drain();
            Finish();
        }
    }

    /// <summary>Runs indices until none are left; the first fault of any worker ends the job: no worker starts another index.</summary>
    void Drain()
    {
        int i;
        while (Volatile.Read(ref _fault) is null && (i = Interlocked.Increment(ref _next) - 1) < _count)
            try { _body(i); }
            catch (Exception e) { Interlocked.CompareExchange(ref _fault, e, null); }
    }

    void Finish()
    {
        if (Interlocked.Decrement(ref _active) == 0) _done.Set();
    }

    public void Dispose()
    {
        _stopping = true;
        foreach (var s in _start) s.Release();
        foreach (var t in _helpers) t.Join();
        foreach (var s in _start) s.Dispose();
        _done.Dispose();
    }
}
