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
    public static GridRecord Open(IReadOnlyList<string> files, string variable, string? units = null, double earthRadius = Sphere.MeanEarthRadius,
        FrameSelection? selection = null)
    {
        if (!(earthRadius > 0)) throw new ArgumentOutOfRangeException(nameof(earthRadius), "the sphere's radius must be positive");
        var source = FrameSource.Open(InputPaths.Expand(files), variable, selection);
        try
        {
            if (units is not null) source.ConvertUnits(units);
            var grid = GridReader.Read(source.Template, source.Axes, earthRadius);
            if (source.FrameLength != grid.CellCount)
                throw new BadInputException(source.Files[0], variable,
                    $"frames have {source.FrameLength} values but the grid has {grid.CellCount} cells: fix the dimensions other than time, latitude and longitude " +
                    $"({string.Join(", ", source.FrameDimensions.Where(d => !IsHorizontal(source, d.Name)).Select(d => $"{d.Name} = {d.Length}"))}) with --level VALUE[UNITS] (the vertical coordinate) or --at DIMENSION=VALUE / DIMENSION#INDEX");
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
                ["quantile_definition"] = "area-weighted, tied values as one atom, Hazen plotting positions (Hyndman & Fan 1996 definition 5 for equal weights without ties)",
            }, Scalars: Scalars);

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
        var chosen = MetricsOf(metrics);
        var dynamicRange = DynamicRange(range);
        var series = new RegionalSeries(PairLayout(regions, chosen, dynamicRange, minValid, Provenance.Pending("GridDrift.GridRecord.Similarity", Files),
            $"Frame-to-frame similarity of {Variable} per region (lag {lag})", lag, [], withBounds: true));
        Pairs(regions, chosen, dynamicRange, minValid, FramePairs.AtLag(_source, lag, acrossGaps: false, out _), series, settings ?? EngineSettings.Default);
        return series;
    }

    /// <summary>
    /// This record (a candidate, e.g. model output on the observation grid) against
    /// <paramref name="reference"/> (e.g. observations) at every time both hold, per region:
    /// bias (candidate − reference), RMS difference, correlation and the structural metrics.
    /// </summary>
    public RegionalSeries Comparison(GridRecord reference, RegionSet regions, IReadOnlyList<SimilarityMetric>? metrics = null, string? range = null, double minValid = 0.5,
        EngineSettings? settings = null)
    {
        var chosen = (metrics ?? [SimilarityMetric.Bias, SimilarityMetric.Rmsd, SimilarityMetric.Corr, SimilarityMetric.Ssim]).Distinct().ToArray();
        var dynamicRange = DynamicRange(range);
        var pairs = SharedTimes(reference);
        var series = new RegionalSeries(PairLayout(regions, chosen, dynamicRange, minValid, Provenance.Pending("GridDrift.GridRecord.Comparison", [.. reference.Files, .. Files]),
            $"Comparison of {Variable}: candidate {Path.GetFileName(Files[0])} against reference {Path.GetFileName(reference.Files[0])}", 0, [], withBounds: false));
        Pairs(regions, chosen, dynamicRange, minValid, pairs, series, settings ?? EngineSettings.Default, reference);
        return series;
    }

    internal static SimilarityMetric[] MetricsOf(IReadOnlyList<SimilarityMetric>? metrics) =>
        (metrics ?? [SimilarityMetric.Ssim, SimilarityMetric.Corr, SimilarityMetric.Rmsd, SimilarityMetric.MeanAbsChange]).Distinct().ToArray();

    /// <summary>SSIM's and VIF's fixed dynamic range L, in the units frames are delivered in.</summary>
    internal DataRange DynamicRange(string? range) => DataRange.Resolve(range, _source.Template.RequireVariable(Variable), Files[0], Units);

    /// <summary>The reference's frame with this record's at every time both hold; refuses records of another grid or calendar.</summary>
    internal List<FramePair> SharedTimes(GridRecord reference)
    {
        if (reference._source.FrameLength != _source.FrameLength)
            throw new BadInputException(reference.Files[0], reference.Variable,
                $"frames have {reference._source.FrameLength} values, the candidate's {_source.FrameLength}: regrid the candidate onto the reference grid first");
        if (reference._source.Calendar != _source.Calendar)
            throw new BadInputException(reference.Files[0], reference._source.Axes.Time!.Name,
                $"is in the {reference._source.Calendar.CfName()} calendar and the candidate in {_source.Calendar.CfName()}: align them first (regrid --calendar)");
        var pairs = FramePairs.AtSharedTimes(reference._source, _source);
        if (pairs.Count == 0) throw new BadInputException(Files[0], Variable, "no time step is shared with the reference");
        return pairs;
    }

    internal SeriesLayout PairLayout(RegionSet regions, IReadOnlyList<SimilarityMetric> metrics, DataRange range, double minValid, Provenance provenance, string title, int lag,
        IReadOnlyList<(CfTime Earlier, CfTime Later)> skipped, bool withBounds) =>
        new(Variable, regions.Names, regions.Areas, metrics.Select(m => m.Quantity(Variable, Units)).ToList(), _source.TimeUnits, CalendarAttribute, provenance,
            new Dictionary<string, string>
            {
                ["title"] = title,
                ["dynamic_range"] = $"{range.Low.ToString("R", CultureInfo.InvariantCulture)}:{range.High.ToString("R", CultureInfo.InvariantCulture)} ({range.Source})",
                ["lag"] = lag.ToString(CultureInfo.InvariantCulture),
                ["earth_radius_m"] = Grid.EarthRadius.ToString("R", CultureInfo.InvariantCulture),
                ["min_valid"] = minValid.ToString("R", CultureInfo.InvariantCulture),
                ["ssim_window"] = "Gaussian sigma 1.5, 11 taps; longitude " + (Ssim.PeriodicFor(Grid) ? "periodic" : "reflected") + ", latitude reflected; normalised convolution over missing cells",
                ["vif_domain"] = "pixel-domain multi-scale VIF terms over the whole frame, summed over each region with cell areas (Sigma w num / Sigma w den), values rescaled to 0-255 over the data range",
                ["skipped_pairs"] = skipped.Count == 0 ? "none" : string.Join("; ", skipped.Select(s => $"{s.Earlier.ToIsoString()}/{s.Later.ToIsoString()}")),
            },
            HasTimeBounds: withBounds, Scalars: Scalars);

    static bool IsHorizontal(FrameSource source, string dimension)
    {
        int d = source.Axes.Data.Dimensions.ToList().FindIndex(x => x.Name == dimension);
        return d >= 0 && source.Axes.DimensionRoles[d] is GridDrift.Conventions.Coordinates.AxisRole.Latitude or GridDrift.Conventions.Coordinates.AxisRole.Longitude
            or GridDrift.Conventions.Coordinates.AxisRole.ProjectionX or GridDrift.Conventions.Coordinates.AxisRole.ProjectionY;
    }

    /// <summary>The dimensions the selection fixed (a level, a member), as CF scalar coordinates for the products.</summary>
    public IReadOnlyList<ScalarCoordinate> Scalars => GridDrift.Workflows.SelectionScalars.Of(_source);

    /// <summary>
    /// The pair metrics of <paramref name="pairs"/> into any series sink: earlier frames from
    /// <paramref name="reference"/> (a comparison), from <paramref name="fixedField"/> (index −1),
    /// or from this record. Gives the number of later-frame cells outside the dynamic range.
    /// </summary>
    internal long Pairs(RegionSet regions, IReadOnlyList<SimilarityMetric> metrics, DataRange range, double minValid, IReadOnlyList<FramePair> pairs, ISeriesSink sink,
        EngineSettings settings, GridRecord? reference = null, float[]? fixedField = null)
    {
        ValidFraction.Check(minValid);
        if (metrics.Count == 0) throw new BadInputException(null, null, "no metric asked for (--metric ssim,vif,corr,rmsd,mean-abs-change)");
        if (Grid.ColumnsFirst)
            throw new BadInputException(Files[0], Variable, "longitude comes before latitude in this variable's dimensions; similarity needs (time, lat, lon) order");
        var op = new SimilarityOperator(regions, range, Ssim.PeriodicFor(Grid), metrics, minValid, Times, reference is null ? Times : null, sink);
        FrameEngine.RunPairs(reference?._source ?? _source, _source, pairs, op, settings, fixedField);
        return op.CellsOutsideRange;
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
