using GridDrift.Conventions.Time;
using GridDrift.Frames;
using GridDrift.Regions;
using GridDrift.Results;

namespace GridDrift.Operators.Statistics;

/// <summary>
/// Area-weighted statistics of each frame per region (<see cref="RegionReducer"/>), handed to a
/// series sink in time order; a region below the minimum valid fraction gives NaN.
/// </summary>
internal sealed class RegionStatisticsOperator : IFrameOperator<RegionStatisticsOperator.Worker>
{
    readonly RegionSet _regions;
    readonly RegionStatistic[] _withValid;
    readonly int _quantities;
    readonly double _minValid;
    readonly IReadOnlyList<CfTime> _times;
    readonly ISeriesSink _sink;
    readonly double[] _values;
    readonly double[] _valid;

    public sealed class Worker(RegionReducer reducer, double[] result)
    {
        internal readonly RegionReducer Reducer = reducer;
        internal readonly double[] Result = result;
    }

    /// <param name="statistics">the quantities of the sink, in order (the valid fraction always goes to the sink's own column)</param>
    public RegionStatisticsOperator(RegionSet regions, IReadOnlyList<RegionStatistic> statistics, double minValid, IReadOnlyList<CfTime> times, ISeriesSink sink)
    {
        _regions = regions;
        _withValid = statistics.Where(s => s != RegionStatistic.Valid).Append(RegionStatistic.Valid).ToArray();
        _quantities = _withValid.Length - 1;
        _minValid = minValid;
        _times = times;
        _sink = sink;
        _values = new double[regions.Count * _quantities];
        _valid = new double[regions.Count];
    }

    /// <summary>Region-frames left out because too little of the region held data.</summary>
    public long BelowMinValid { get; private set; }

    /// <summary>Region-frames with no data at all.</summary>
    public long NoData { get; private set; }

    public Worker NewWorker() => new(new RegionReducer(_regions, _withValid), new double[_regions.Count * _withValid.Length]);

    public void Process(Worker worker, int frame, in FrameInputs inputs) => worker.Reducer.Reduce(inputs.Primary, worker.Result);

    public void Complete(Worker worker, int frame)
    {
        int stride = _withValid.Length;
        var result = worker.Result;
        for (int r = 0; r < _regions.Count; r++)
        {
            double v = result[r * stride + stride - 1];
            _valid[r] = v;
            bool keep = ValidFraction.Keeps(v, _minValid);
            if (!(v > 0)) NoData++;
            else if (!keep) BelowMinValid++;
            for (int q = 0; q < _quantities; q++) _values[r * _quantities + q] = keep ? result[r * stride + q] : double.NaN;
        }
        _sink.Write(_times[frame], _values, _valid);
    }
}
