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
    readonly RegionMask _mask;
    readonly RegionStatistic[] _statistics;
    readonly double[] _probabilities;
    readonly int[] _quantileSlots;
    readonly float[] _values;
    readonly double[] _weights;
    readonly double[] _quantileResults;
    readonly SeparableReducer? _separable;
    readonly double[] _moments;

    /// <param name="plan">the box fast path for moments and extremes, where the regions allow it</param>
    public RegionReducer(RegionMask mask, IReadOnlyList<RegionStatistic> statistics, SeparablePlan? plan = null)
    {
        _separable = plan is null ? null : new SeparableReducer(plan);
        _moments = plan is null ? [] : new double[5 * mask.Count];
        _mask = mask;
        _statistics = statistics.ToArray();
        var quantiles = _statistics.Select((s, i) => (s.Quantile(), i)).Where(x => x.Item1 is not null).ToArray();
        _probabilities = quantiles.Select(q => q.Item1!.Value).ToArray();
        _quantileSlots = quantiles.Select(q => q.i).ToArray();
        int largest = 0;
        for (int r = 0; r < mask.Count; r++) largest = Math.Max(largest, mask.RowStart[r + 1] - mask.RowStart[r]);
        _values = _probabilities.Length > 0 ? new float[largest] : [];
        _weights = _probabilities.Length > 0 ? new double[largest] : [];
        _quantileResults = new double[_probabilities.Length];
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
        for (int r = 0; r < _mask.Count; r++)
        {
            var cells = _mask.CellsOf(r);
            var areas = _mask.AreasOf(r);
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
                    RegionStatistic.Valid => ValidFraction.Of(sw, _mask.RegionArea[r]),
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
        bool wantQuantiles = _probabilities.Length > 0;
        for (int r = 0; r < _mask.Count; r++)
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
                    RegionStatistic.Valid => ValidFraction.Of(m[0], _mask.RegionArea[r]),
                    _ => double.NaN,
                };
            }
            if (!wantQuantiles) continue;
            var cells = _mask.CellsOf(r);
            var areas = _mask.AreasOf(r);
            int n = 0;
            for (int k = 0; k < cells.Length; k++)
            {
                float x = frame[cells[k]];
                if (float.IsNaN(x)) continue;
                _values[n] = x;
                _weights[n++] = areas[k];
            }
            WeightedQuantile.Evaluate(_values.AsSpan(0, n), _weights.AsSpan(0, n), _probabilities, _quantileResults);
            for (int q = 0; q < _quantileSlots.Length; q++) slot[_quantileSlots[q]] = n > 0 ? _quantileResults[q] : double.NaN;
        }
    }
}
