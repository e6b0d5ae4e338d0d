using GridDrift.Conventions.Time;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Results;
using GridDrift.Operators.Statistics;

namespace GridDrift.Operators.Similarity;

/// <summary>
/// The pair metrics of one pair of frames per region — SSIM (area-weighted mean of the SSIM
/// map), VIF (ratio of the region's area-weighted sums of the frame's VIF term maps,
/// <see cref="VifField"/>), correlation, RMS difference, mean absolute change
/// and bias — handed to a series sink in time order, stamped with the later frame's time (and the
/// earlier one's, for frame-to-frame pairs).
/// </summary>
internal sealed class SimilarityOperator : IPairOperator<SimilarityOperator.Worker>
{
    readonly Grid _grid;
    readonly RegionSet _regions;
    readonly SeparablePlan? _plan;
    readonly DataRange _range;
    readonly bool _periodic;
    readonly IReadOnlyList<SimilarityMetric> _metrics;
    readonly double _minValid;
    readonly bool _wantsVif;
    readonly IReadOnlyList<CfTime> _laterTimes;
    readonly IReadOnlyList<CfTime>? _earlierTimes;
    readonly ISeriesSink _sink;
    readonly List<Worker> _workers = [];

    public sealed class Worker
    {
        public required Ssim Ssim;
        public required VifField? Vif;
        public required RegionReducer MapReducer;
        public required float[] Map;
        public required double[] MapStats;
        public required float[] VifNum;
        public required float[] VifDen;
        public required double[] VifNumStats;
        public required double[] VifDenStats;
        public required double[] PairStats;
        public required SeparablePairReducer? Pairs;
        public required double[] Values;
        public required double[] Valid;
        internal long Outside;
    }

    /// <param name="earlierTimes">the earlier frames' times, stamped beside the later one's (frame-to-frame pairs); null for comparisons</param>
    public SimilarityOperator(RegionSet regions, DataRange range, bool periodic, IReadOnlyList<SimilarityMetric> metrics, double minValid,
        IReadOnlyList<CfTime> laterTimes, IReadOnlyList<CfTime>? earlierTimes, ISeriesSink sink)
    {
        _grid = regions.Grid;
        _regions = regions;
        _plan = regions.Separable;
        _range = range;
        _periodic = periodic;
        _metrics = metrics;
        _minValid = minValid;
        _wantsVif = metrics.Contains(SimilarityMetric.Vif);
        _laterTimes = laterTimes;
        _earlierTimes = earlierTimes;
        _sink = sink;
    }

    /// <summary>Cells of the later frames outside the data range (SSIM's and VIF's scaling assume the range holds them).</summary>
    public long CellsOutsideRange => _workers.Sum(w => w.Outside);

    public Worker NewWorker()
    {
        // SSIM's map is reduced before VIF's terms are computed: VIF's numerator map reuses its memory
        var map = _metrics.Contains(SimilarityMetric.Ssim) || _wantsVif ? new float[_grid.CellCount] : [];
        var w = new Worker
        {
            Ssim = new Ssim(_grid.Rows, _grid.Columns, _periodic, _range.Low, _range.High),
            Vif = _wantsVif ? new VifField(_grid.Rows, _grid.Columns, _periodic, _range.Low, _range.High) : null,
            MapReducer = new RegionReducer(_regions, [RegionStatistic.Mean, RegionStatistic.Valid]),
            Map = _metrics.Contains(SimilarityMetric.Ssim) ? map : [],
            MapStats = new double[_regions.Count * 2],
            VifNum = _wantsVif ? map : [],
            VifDen = _wantsVif ? new float[_grid.CellCount] : [],
            VifNumStats = new double[_regions.Count * 2],
            VifDenStats = new double[_regions.Count * 2],
            PairStats = new double[_regions.Count * PairReducer.Stride],
            Pairs = _plan is null ? null : new SeparablePairReducer(_plan),
            Values = new double[_regions.Count * _metrics.Count],
            Valid = new double[_regions.Count],
        };
        lock (_workers) _workers.Add(w);
        return w;
    }

    public void Process(Worker w, FramePair pair, ReadOnlySpan<float> a, ReadOnlySpan<float> b)
    {
        int nq = _metrics.Count;
        foreach (var v in b) if (v < _range.Low || v > _range.High) w.Outside++;
        if (w.Pairs is { } separable) separable.Reduce(a, b, _regions.Areas, w.PairStats);
        else PairReducer.Reduce(_regions.Mask, a, b, w.PairStats);
        if (_metrics.Contains(SimilarityMetric.Ssim))
        {
            w.Ssim.Map(a, b, w.Map);
            w.MapReducer.Reduce(w.Map, w.MapStats);
        }
        if (w.Vif is { } vif)
        {
            vif.Terms(a, b, w.VifNum, w.VifDen);
            w.MapReducer.Reduce(w.VifNum, w.VifNumStats);
            w.MapReducer.Reduce(w.VifDen, w.VifDenStats);
        }
        for (int r = 0; r < _regions.Count; r++)
        {
            double valid = w.PairStats[PairReducer.Stride * r + 3];
            w.Valid[r] = valid;
            bool drop = !ValidFraction.Keeps(valid, _minValid);
            for (int q = 0; q < nq; q++)
            {
                double value = drop ? double.NaN : _metrics[q] switch
                {
                    SimilarityMetric.Ssim => w.MapStats[2 * r + 1] >= _minValid ? w.MapStats[2 * r] : double.NaN,
                    SimilarityMetric.Corr => w.PairStats[PairReducer.Stride * r],
                    SimilarityMetric.Rmsd => w.PairStats[PairReducer.Stride * r + 1],
                    SimilarityMetric.MeanAbsChange => w.PairStats[PairReducer.Stride * r + 2],
                    SimilarityMetric.Bias => w.PairStats[PairReducer.Stride * r + 4],
                    // both maps have the same valid cells, so the ratio of their means is Σw·num / Σw·den
                    SimilarityMetric.Vif => w.VifDenStats[2 * r] > 0 ? w.VifNumStats[2 * r] / w.VifDenStats[2 * r] : double.NaN,
                    _ => double.NaN,
                };
                w.Values[r * nq + q] = value;
            }
        }
    }

    public void Complete(Worker w, FramePair pair) =>
        _sink.Write(_laterTimes[pair.Later], w.Values, w.Valid, _earlierTimes is not null && pair.Earlier >= 0 ? _earlierTimes[pair.Earlier] : null);
}
