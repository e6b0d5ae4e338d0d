using GridDrift.Conventions.Time;

namespace GridDrift.Results;

/// <summary>
/// A regional series in memory: per time step and region, the value of each quantity and the
/// valid fraction of the region's area, with the layout (regions, areas, quantities with units and
/// CF cell methods, time units and calendar, provenance) a product needs. It is a series sink,
/// so the frame engine fills it as it would a file; Outputs writes it as NetCDF or Parquet.
/// </summary>
public sealed class RegionalSeries : ISeriesSink
{
    readonly List<CfTime> _times = [];
    readonly List<CfTime?> _earlier = [];
    readonly List<double> _values = [];
    readonly List<double> _valid = [];

    public RegionalSeries(SeriesLayout layout) => Layout = layout;

    public SeriesLayout Layout { get; }

    /// <summary>The time of each step (for pairs, the later frame's).</summary>
    public IReadOnlyList<CfTime> Times => _times;

    /// <summary>For pairs of frames, the earlier frame's time of each step; null otherwise.</summary>
    public IReadOnlyList<CfTime?> EarlierTimes => _earlier;

    public IReadOnlyList<string> Regions => Layout.Regions;

    public IReadOnlyList<string> Quantities => Layout.Quantities.Select(q => q.Name).ToList();

    /// <summary>The value of <paramref name="quantity"/> in <paramref name="region"/> at step <paramref name="time"/> (NaN where too little of the region held data).</summary>
    public double Value(int time, int region, int quantity) =>
        _values[(time * Layout.Regions.Count + region) * Layout.Quantities.Count + quantity];

    /// <summary>The valid fraction of the region's area at step <paramref name="time"/>.</summary>
    public double ValidFraction(int time, int region) => _valid[time * Layout.Regions.Count + region];

    /// <summary>One region's series of one quantity, by name.</summary>
    public double[] Of(string region, string quantity)
    {
        int r = IndexOf(Layout.Regions, region, "region");
        int q = IndexOf(Quantities, quantity, "quantity");
        var series = new double[_times.Count];
        for (int t = 0; t < series.Length; t++) series[t] = Value(t, r, q);
        return series;
    }

    static int IndexOf(IReadOnlyList<string> names, string name, string what)
    {
        for (int i = 0; i < names.Count; i++) if (names[i] == name) return i;
        throw new ArgumentException($"no {what} '{name}' (the series has {string.Join(", ", names)})");
    }

    public void Write(CfTime time, ReadOnlySpan<double> values, ReadOnlySpan<double> validFraction, CfTime? earlier = null)
    {
        _times.Add(time);
        _earlier.Add(earlier);
        foreach (var v in values) _values.Add(v);
        foreach (var v in validFraction) _valid.Add(v);
    }

    /// <summary>Replays the steps in time order into another sink (a file writer).</summary>
    public void CopyTo(ISeriesSink sink)
    {
        int perStep = Layout.Regions.Count * Layout.Quantities.Count, regions = Layout.Regions.Count;
        var values = _values.ToArray();
        var valid = _valid.ToArray();
        for (int t = 0; t < _times.Count; t++)
            sink.Write(_times[t], values.AsSpan(t * perStep, perStep), valid.AsSpan(t * regions, regions), _earlier[t]);
    }

    public void Complete() { }

    public void Dispose() { }
}
