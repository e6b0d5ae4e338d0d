using GridDrift.Conventions.Time;
using GridDrift.Frames;
using GridDrift.Regions;
using GridDrift.Results;
using GridDrift.Operators.Statistics;

namespace GridDrift.Operators.Climatology;

/// <summary>
/// Departures of each frame from its slot of a climatology (<see cref="Anomaly.Compute"/>),
/// handed on as fields and, with a region mask, as area-weighted region means. A frame that falls
/// in no slot (a time of day the climatology does not hold) is all missing.
/// </summary>
internal sealed class AnomalyOperator : IFrameOperator<AnomalyOperator.Worker>
{
    readonly AnomalyKind _kind;
    readonly SlotScheme _scheme;
    readonly float[] _mean, _std;
    readonly int _cells;
    readonly RegionSet? _regions;
    readonly double _minValid;
    readonly IReadOnlyList<CfTime> _times;
    readonly IFieldSink? _fields;
    readonly ISeriesSink? _series;
    readonly double[] _values, _valid;

    public sealed class Worker(float[] anomaly, RegionReducer? reducer, double[] result)
    {
        internal readonly float[] Anomaly = anomaly;
        internal readonly RegionReducer? Reducer = reducer;
        internal readonly double[] Result = result;
        internal int Slot;
    }

    /// <param name="mean">per slot and cell, slot-major (the climatology's mean)</param>
    /// <param name="std">per slot and cell (the climatology's standard deviation)</param>
    public AnomalyOperator(AnomalyKind kind, SlotScheme scheme, float[] mean, float[] std, int cells, RegionSet? regions, double minValid,
        IReadOnlyList<CfTime> times, IFieldSink? fields, ISeriesSink? series)
    {
        _kind = kind;
        _scheme = scheme;
        _mean = mean;
        _std = std;
        _cells = cells;
        _regions = regions;
        _minValid = minValid;
        _times = times;
        _fields = fields;
        _series = series;
        _values = new double[regions?.Count ?? 0];
        _valid = new double[regions?.Count ?? 0];
    }

    /// <summary>Frames that fell in no slot of the climatology.</summary>
    public int FramesWithoutSlot { get; private set; }

    public Worker NewWorker() => new(new float[_cells],
        _regions is null ? null : new RegionReducer(_regions, [RegionStatistic.Mean, RegionStatistic.Valid]), new double[(_regions?.Count ?? 0) * 2]);

    public void Process(Worker w, int frame, in FrameInputs inputs)
    {
        int slot = _scheme.SlotOf(_times[frame]);
        w.Slot = slot;
        if (slot < 0) Array.Fill(w.Anomaly, float.NaN);
        else Anomaly.Compute(_kind, inputs.Primary, _mean.AsSpan(slot * _cells, _cells), _std.AsSpan(slot * _cells, _cells), w.Anomaly);
        w.Reducer?.Reduce(w.Anomaly, w.Result);
    }

    public void Complete(Worker w, int frame)
    {
        if (w.Slot < 0) FramesWithoutSlot++;
        _fields?.Write(_times[frame], w.Anomaly);
        if (_series is null) return;
        for (int r = 0; r < _values.Length; r++)
        {
            double v = w.Result[2 * r + 1];
            _valid[r] = v;
            _values[r] = ValidFraction.Keeps(v, _minValid) ? w.Result[2 * r] : double.NaN;
        }
        _series.Write(_times[frame], _values, _valid);
    }
}
