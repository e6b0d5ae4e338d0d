using System.Globalization;
using GridDrift.Operators.Climatology;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Regions;
using GridDrift.Results;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;

namespace GridDrift;

/// <summary>
/// One variable of a gridded record — one file or many split along time — opened for analysis
/// in memory: regional series of area-weighted statistics, frame-to-frame similarity and
/// climatologies, computed by the same frame engine and operators as the command line, returned
/// as typed results that can then be written as products (<see cref="Outputs.Series.SeriesFiles"/>).
/// </summary>
/// <example>
/// <code>
/// using var record = GridRecord.Open(["tcwv_2031.nc"], "tcwv");
/// var regions = record.Regions("global", "bands:30");
/// var stats = record.RegionStatistics(regions, [RegionStatistic.Mean, RegionStatistic.Std]);
/// double[] tropics = stats.Of("band_-30_0", "mean");
/// </code>
/// </example>
public sealed class GridRecord : IDisposable
{
    readonly FrameSource _source;

    GridRecord(FrameSource source, Grid grid)
    {
        _source = source;
        Grid = grid;
    }

    /// <summary>
    /// Opens <paramref name="variable"/> in <paramref name="files"/> (globs allowed; any order: frames are
    /// put in time order), delivered in <paramref name="units"/> when given. Bad input is refused with a
    /// <see cref="BadInputException"/> naming the file, the variable and the fault.
    /// </summary>
    public static GridRecord Open(IReadOnlyList<string> files, string variable, string? units = null, double earthRadius = Sphere.MeanEarthRadius)
    {
        if (!(earthRadius > 0)) throw new ArgumentOutOfRangeException(nameof(earthRadius), "the sphere's radius must be positive");
        var source = FrameSource.Open(InputPaths.Expand(files), variable);
        try
        {
            if (units is not null) source.ConvertUnits(units);
            var grid = GridReader.Read(source.Template, source.Axes, earthRadius);
            if (source.FrameLength != grid.CellCount)
                throw new BadInputException(source.Files[0], variable,
                    $"frames have {source.FrameLength} values but the grid has {grid.CellCount} cells: dimensions other than time, latitude and longitude " +
                    $"({string.Join(", ", source.FrameDimensions.Select(d => $"{d.Name} = {d.Length}"))}) are not supported here yet");
            return new GridRecord(source, grid);
        }
        catch
        {
            source.Dispose();
            throw;
        }
    }

    public string Variable => _source.VariableName;
    public string Units => _source.Units;
    public IReadOnlyList<string> Files => _source.Files;
    public IReadOnlyList<CfTime> Times => _source.Times;
    public int FrameCount => _source.FrameCount;
    public Grid Grid { get; }
    /// <summary>Gaps in the record's time steps.</summary>
    public IReadOnlyList<TimeGap> Gaps => _source.Gaps;
    /// <summary>What decoding the files noticed (unusual packing, fill values) without refusing them.</summary>
    public IReadOnlyList<string> Warnings => _source.Warnings;

    internal FrameSource Source => _source;

    /// <summary>Regions on this record's grid: global, bands:STEP, tiles:DLATxDLON, box:NAME=S,N,W,E, file:PATH.geojson.</summary>
    public RegionSet Regions(params string[] specs) => RegionSet.Build(Grid, specs);

    /// <summary>
    /// Area-weighted statistics of every frame per region (default: mean, std, min, max, p10, p50,
    /// p90); a region with less than <paramref name="minValid"/> of its area valid gives NaN.
    /// </summary>
    public RegionalSeries RegionStatistics(RegionSet regions, IReadOnlyList<RegionStatistic>? statistics = null, double minValid = 0.5, EngineSettings? settings = null)
    {
        var chosen = StatisticsOf(statistics);
        var series = new RegionalSeries(StatisticsLayout(regions, chosen, minValid, "GridDrift.GridRecord.RegionStatistics", Files, computeChecksums: false));
        RegionStatistics(regions, chosen, minValid, series, FrameSlice.Whole(FrameCount), settings ?? EngineSettings.Default);
        return series;
    }

    internal static RegionStatistic[] StatisticsOf(IReadOnlyList<RegionStatistic>? statistics) =>
        (statistics ?? GridDrift.Operators.Statistics.RegionStatistics.All).Where(s => s != RegionStatistic.Valid).Distinct().ToArray();

    /// <summary>The statistics of a slice of the record into any series sink (the command line's products); counts of region-frames left out.</summary>
    internal (long BelowMinValid, long NoData) RegionStatistics(RegionSet regions, IReadOnlyList<RegionStatistic> statistics, double minValid, ISeriesSink sink, FrameSlice slice,
        EngineSettings settings)
    {
        ValidFraction.Check(minValid);
        if (slice.End > FrameCount) throw new ArgumentOutOfRangeException(nameof(slice), $"frames {slice.First}..{slice.End} lie beyond the record's {FrameCount}");
        var op = new RegionStatisticsOperator(regions, statistics, minValid, Times, sink);
        FrameEngine.Run(_source, Enumerable.Range(slice.First, slice.Count).ToArray(), op, settings);
        return (op.BelowMinValid, op.NoData);
    }

    internal SeriesLayout StatisticsLayout(RegionSet regions, IReadOnlyList<RegionStatistic> statistics, double minValid, string command, IReadOnlyList<string> inputs,
        bool computeChecksums = true) =>
        new(Variable, regions.Names, regions.Areas, statistics.Select(s => s.Quantity(Variable, Units)).ToList(), _source.TimeUnits, CalendarAttribute,
            computeChecksums ? Provenance.For(command, inputs) : Provenance.Pending(command, inputs),
            new Dictionary<string, string>
            {
                ["title"] = $"Area-weighted statistics of {Variable} per region",
                ["earth_radius_m"] = Grid.EarthRadius.ToString("R", CultureInfo.InvariantCulture),
                ["min_valid"] = minValid.ToString("R", CultureInfo.InvariantCulture),
                ["quantile_definition"] = "area-weighted, Hazen plotting positions (Hyndman & Fan 1996 definition 5 for equal weights)",
            });

    /// <summary>
    /// Frame-to-frame similarity per region: each frame against the one <paramref name="lag"/>
    /// steps earlier (pairs across gaps in the record are left out). SSIM's and VIF's dynamic
    /// range L is <paramref name="range"/> ("LO:HI"), else the variable's valid range, else a
    /// default for its standard_name.
    /// </summary>
    public RegionalSeries Similarity(RegionSet regions, IReadOnlyList<SimilarityMetric>? metrics = null, int lag = 1, string? range = null, double minValid = 0.5,
        EngineSettings? settings = null)
    {
        if (lag < 1) throw new ArgumentOutOfRangeException(nameof(lag), "the lag must be at least 1");
        ValidFraction.Check(minValid);
        var chosen = (metrics ?? [SimilarityMetric.Ssim, SimilarityMetric.Corr, SimilarityMetric.Rmsd, SimilarityMetric.MeanAbsChange]).Distinct().ToArray();
        var dynamicRange = DataRange.Resolve(range, _source.Template.RequireVariable(Variable), Files[0], Units);
        var pairs = FramePairs.AtLag(_source, lag, acrossGaps: false, out _);
        var layout = new SeriesLayout(Variable, regions.Names, regions.Areas, chosen.Select(m => m.Quantity(Variable, Units)).ToList(), _source.TimeUnits, CalendarAttribute,
            Provenance.Pending("GridDrift.GridRecord.Similarity", Files),
            new Dictionary<string, string>
            {
                ["title"] = $"Frame-to-frame similarity of {Variable} per region (lag {lag})",
                ["dynamic_range"] = $"{dynamicRange.Low.ToString("R", CultureInfo.InvariantCulture)}:{dynamicRange.High.ToString("R", CultureInfo.InvariantCulture)} ({dynamicRange.Source})",
                ["lag"] = lag.ToString(CultureInfo.InvariantCulture),
            },
            HasTimeBounds: true);
        var series = new RegionalSeries(layout);
        var op = new SimilarityOperator(regions, dynamicRange, Ssim.PeriodicFor(Grid), chosen, minValid, Times, Times, series);
        FrameEngine.RunPairs(_source, _source, pairs, op, settings ?? EngineSettings.Default);
        return series;
    }

    /// <summary>
    /// Mean, population standard deviation and sample count per cell and slot (calendar month,
    /// day of the year or hour of each month) over the base period <paramref name="basePeriod"/>
    /// (START/END, e.g. 1991/2020; default the whole record).
    /// </summary>
    public GridClimatology Climatology(ClimatologyKind kind, string? basePeriod = null, EngineSettings? settings = null)
    {
        var period = BasePeriods.Resolve(_source, basePeriod);
        var used = Enumerable.Range(0, FrameCount).Where(i => period.Contains(Times[i])).ToArray();
        if (used.Length == 0) throw new BadInputException(Files[0], Variable, $"no time step falls in the base period {period.ToIsoString()}");
        var scheme = SlotScheme.For(kind, _source.Calendar, used.Select(i => Times[i]));
        var state = new MomentState(scheme.SlotCount, _source.FrameLength);
        try
        {
            FrameEngine.RunBatches(_source, used, new SlotAccumulator(scheme, state, Times), settings ?? EngineSettings.Default);
            return new GridClimatology(scheme, state, period, used.Length);
        }
        catch
        {
            state.Dispose();
            throw;
        }
    }

    string CalendarAttribute => _source.Template.RequireVariable(_source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard";

    public void Dispose() => _source.Dispose();
}
