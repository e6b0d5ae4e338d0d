using GridDrift.Conventions.Time;
using GridDrift.Frames;
using GridDrift.Results;
using GridDrift.Grids.Regridding;

namespace GridDrift.Operators.Resampling;

/// <summary>Each frame remapped with weights built once (<see cref="RemapWeights.Apply"/>), handed on in time order with its covered fraction.</summary>
internal sealed class RegridOperator(RemapWeights weights, IReadOnlyList<CfTime> times, ICoveredFieldSink sink) : IFrameOperator<RegridOperator.Worker>
{
    public sealed class Worker(int cells)
    {
        internal readonly float[] Output = new float[cells];
        internal readonly float[] Covered = new float[cells];
    }

    public Worker NewWorker() => new(weights.TargetCells);

    public void Process(Worker worker, int frame, in FrameInputs inputs) => weights.Apply(inputs.Primary, worker.Output, worker.Covered);

    public void Complete(Worker worker, int frame) => sink.Write(times[frame], worker.Output, worker.Covered);
}
