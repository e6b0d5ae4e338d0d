using GridDrift.Regions;

namespace GridDrift.Operators.Statistics;

/// <summary>
/// Area-weighted statistics of every region of a mask over one frame, in float64: mean
/// Σwx/Σw, standard deviation √(Σw(x−mean)²/Σw) (the population form: the region is all there
/// is), minimum and maximum over the cells with any area inside, weighted quantiles
/// (<see cref="WeightedQuantile"/>) and the valid fraction Σw(valid)/region area. Missing cells
/// (NaN) are left out. Moments use sums shifted by the region's first valid value, which keeps
/// float64 sums exact to ~1e-15 relative for physical fields.
/// One reducer per worker thread: its scratch buffers are reused frame after frame.
/// </summary>
internal sealed class RegionReducer
{
    readonly RegionMask? _mask;
    readonly int _count;
    readonly IReadOnlyList<double> _regionArea;
    readonly RegionStatistic[] _statistics;
    readonly double[] _probabilities;
    readonly int[] _quantileSlots;
    readonly float[] _values;
    readonly double[] _weights;
    readonly double[] _quantileResults;
    readonly SeparableReducer? _separable;
    readonly BoxQuantiles? _boxQuantiles;
    readonly double[] _moments;

    /// <summary>A reducer over the regions' boxes where they are separable (<see cref="SeparablePlan"/>), else over their mask.</summary>
    public RegionReducer(RegionSet regions, IReadOnlyList<RegionStatistic> statistics)
        : this(regions.Separable is null ? regions.Mask : null, regions.Separable, regions.Count, regions.Areas, statistics) { }

    /// <summary>A reducer over the mask's cells, region by region.</summary>
    public RegionReducer(RegionMask mask, IReadOnlyList<RegionStatistic> statistics)
        : this(mask, null, mask.Count, mask.RegionArea, statistics) { }

    RegionReducer(RegionMask? mask, SeparablePlan? plan, int count, IReadOnlyList<double> regionArea, IReadOnlyList<RegionStatistic> statistics)
    {
        _mask = mask;
        _count = count;
        _regionArea = regionArea;
        _statistics = statistics.ToArray();
        var quantiles = _statistics.Select((s, i) => (s.Quantile(), i)).Where(x => x.Item1 is not null).ToArray();
        _probabilities = quantiles.Select(q => q.Item1!.Value).ToArray();
        _quantileSlots = quantiles.Select(q => q.i).ToArray();
        _quantileResults = new double[_probabilities.Length];
        _separable = plan is null ? null : new SeparableReducer(plan);
        _boxQuantiles = plan is not null && _probabilities.Length > 0 ? new BoxQuantiles(plan) : null;
        _moments = plan is null ? [] : new double[5 * count];
        int largest = 0;
        if (mask is not null && _probabilities.Length > 0)
            for (int r = 0; r < mask.Count; r++) largest = Math.Max(largest, mask.RowStart[r + 1] - mask.RowStart[r]);
        _values = new float[largest];
        _weights = new double[largest];
    }

    public IReadOnlyList<RegionStatistic> Statistics => _statistics;

    /// <summary>Writes, for region r and statistic s, output[r × statistics + s].</summary>
    public void Reduce(ReadOnlySpan<float> frame, Span<double> output)
    {
        if (_separable is not null)
        {
            ReduceSeparable(frame, output);
            return;
        }
        int ns = _statistics.Length;
        var mask = _mask!;
        for (int r = 0; r < _count; r++)
        {
            var cells = mask.CellsOf(r);
            var areas = mask.AreasOf(r);
            double sw = 0, swd = 0, swd2 = 0, shift = double.NaN;
            float min = float.PositiveInfinity, max = float.NegativeInfinity;
            int n = 0;
            bool wantQuantiles = _probabilities.Length > 0;
            for (int k = 0; k < cells.Length; k++)
            {
                float x = frame[cells[k]];
                if (float.IsNaN(x)) continue;
                double w = areas[k];
                if (double.IsNaN(shift)) shift = x;
                double d = x - shift;
                sw += w;
                swd += w * d;
                swd2 += w * d * d;
                if (x < min) min = x;
                if (x > max) max = x;
                if (wantQuantiles)
                {
                    _values[n] = x;
                    _weights[n] = w;
                }
                n++;
            }
            double mean = sw > 0 ? shift + swd / sw : double.NaN;
            double variance = sw > 0 ? Math.Max(0, swd2 / sw - (swd / sw) * (swd / sw)) : double.NaN;
            if (wantQuantiles) WeightedQuantile.Evaluate(_values.AsSpan(0, n), _weights.AsSpan(0, n), _probabilities, _quantileResults);
            var slot = output.Slice(r * ns, ns);
            for (int s = 0; s < ns; s++)
            {
                slot[s] = _statistics[s] switch
                {
                    RegionStatistic.Mean => mean,
                    RegionStatistic.Std => Math.Sqrt(variance),
                    RegionStatistic.Min => n > 0 ? min : double.NaN,
                    RegionStatistic.Max => n > 0 ? max : double.NaN,
                    RegionStatistic.Valid => ValidFraction.Of(sw, _regionArea[r]),
                    _ => double.NaN,
                };
            }
            for (int q = 0; q < _quantileSlots.Length; q++) slot[_quantileSlots[q]] = n > 0 ? _quantileResults[q] : double.NaN;
        }
    }

    void ReduceSeparable(ReadOnlySpan<float> frame, Span<double> output)
    {
        _separable!.Reduce(frame, _moments);
        int ns = _statistics.Length;
        _boxQuantiles?.Bin(frame);
        for (int r = 0; r < _count; r++)
        {
            var m = _moments.AsSpan(5 * r, 5);
            var slot = output.Slice(r * ns, ns);
            for (int s = 0; s < ns; s++)
            {
                slot[s] = _statistics[s] switch
                {
                    RegionStatistic.Mean => m[1],
                    RegionStatistic.Std => Math.Sqrt(m[2]),
                    RegionStatistic.Min => m[3],
                    RegionStatistic.Max => m[4],
                    RegionStatistic.Valid => ValidFraction.Of(m[0], _regionArea[r]),
                    _ => double.NaN,
                };
            }
            if (_boxQuantiles is null) continue;
            _boxQuantiles.Evaluate(r, frame, m[3], m[4], _probabilities, _quantileResults);
            for (int q = 0; q < _quantileSlots.Length; q++) slot[_quantileSlots[q]] = _quantileResults[q];
        }
    }
}
