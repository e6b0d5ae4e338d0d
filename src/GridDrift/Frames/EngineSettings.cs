namespace GridDrift.Frames;

/// <summary>
/// How the frame engine runs: how many workers (0: one per core), where progress goes, and when
/// to stop. One object carries them from the command line or a caller down to the frame loop.
/// </summary>
public sealed record EngineSettings(int Workers = 0, IProgress<(int Done, int Total)>? Progress = null, CancellationToken Cancel = default)
{
    public static readonly EngineSettings Default = new();

    /// <summary>The workers a run uses: <see cref="Workers"/>, or one per core when it is 0.</summary>
    public int WorkerCount => Math.Max(1, Workers > 0 ? Workers : Environment.ProcessorCount);
}
