using GridDrift.Conventions.Time;
using GridDrift.Conventions.Units;
using GridDrift.Frames;
using GridDrift.Results;

namespace GridDrift.Operators.Physics;

/// <summary>
/// Total column water vapour of each frame of specific humidity on pressure levels
/// (<see cref="Moisture.ColumnWaterVapour"/>), each column bounded by the surface pressure when a
/// second source delivers it. Frames are (level, cells) with the levels first.
/// </summary>
/// <param name="levels">pressure of each level, Pa</param>
/// <param name="cells">horizontal cells of one level</param>
/// <param name="qScale">factor taking the humidity's units to kg kg-1</param>
/// <param name="surfaceScale">factor taking the surface pressure's units to Pa</param>
/// <param name="output">from kg m-2 to the units asked for, or null</param>
internal sealed class ColumnWaterVapourOperator(double[] levels, int cells, double qScale, double surfaceScale, UnitConverter? output, bool bounded,
    IReadOnlyList<CfTime> times, IFieldSink sink) : IFrameOperator<ColumnWaterVapourOperator.Worker>
{
    public sealed class Worker(int levels, int cells)
    {
        internal readonly double[] Column = new double[levels];
        internal readonly float[] Result = new float[cells];
    }

    public Worker NewWorker() => new(levels.Length, cells);

    public void Process(Worker w, int frame, in FrameInputs inputs)
    {
        var q = inputs.Primary;
        var ps = bounded ? inputs[1] : default;
        for (int c = 0; c < cells; c++)
        {
            for (int k = 0; k < levels.Length; k++) w.Column[k] = q[k * cells + c] * qScale;
            double bottom = bounded ? ps[c] * surfaceScale : double.NaN;
            double v = bounded && double.IsNaN(bottom) ? double.NaN : Moisture.ColumnWaterVapour(levels, w.Column, bottom);
            w.Result[c] = double.IsNaN(v) ? float.NaN : (float)(output?.Convert(v) ?? v);
        }
    }

    public void Complete(Worker w, int frame) => sink.Write(times[frame], w.Result);
}
