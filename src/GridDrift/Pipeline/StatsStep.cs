using GridDrift.Conventions.Coordinates;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Series;
using GridDrift.Regions;
using GridDrift.Statistics;
using GridDrift.Results;

namespace GridDrift.Pipeline;

public sealed record StatsOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    IReadOnlyList<string> Regions,
    IReadOnlyList<RegionStatistic> Statistics,
    string Output,
    string? Table = null,
    double MinValid = 0.5,
    double EarthRadius = Sphere.MeanEarthRadius,
    ClassicVariant? Format = null,
    string Command = "griddrift stats",
    int Workers = 0,
    string? Units = null,
    FrameSlice? Slice = null);

/// <summary>What a stats run did, for the summary line and for tests.</summary>
public sealed record StatsSummary(int Frames, int Regions, long Values, long BelowMinValid, long NoData, Grid Grid, RegionMask Mask);

/// <summary>
/// `griddrift stats`: area-weighted statistics per frame and region, streamed. Frames are read
/// and reduced by a pool of workers, one frame each, and written in time order; frames in
/// flight are bounded by the worker count, so memory does not grow with the record.
/// </summary>
public static class StatsStep
{
    public static StatsSummary Run(StatsOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        ValidFraction.Check(o.MinValid);
        using var source = FrameSource.Open(o.Inputs, o.Variable);
        if (o.Units is { } wantedUnits) source.ConvertUnits(wantedUnits);
        var grid = GridReader.Read(source.Template, source.Axes, o.EarthRadius);
        if (source.FrameLength != grid.CellCount)
            throw new BadInputException(source.Files[0], o.Variable,
                $"frames have {source.FrameLength} values but the grid has {grid.CellCount} cells: dimensions other than time, latitude and longitude " +
                $"({string.Join(", ", source.FrameDimensions.Select(d => $"{d.Name} = {d.Length}"))}) are not supported by stats yet");
        var shapes = RegionSpecs.ParseInput(o.Regions);
        var mask = RegionMaskBuilder.Build(grid, shapes);
        var plan = SeparablePlan.TryBuild(grid, shapes);
        var statistics = o.Statistics.Where(s => s != RegionStatistic.Valid).ToArray();
        var units = source.Units;
        var layout = new SeriesLayout(o.Variable, mask.Names, mask.RegionArea, statistics.Select(s => Quantity(s, o.Variable, units)).ToList(),
            source.TimeUnits, source.Template.RequireVariable(source.Axes.Time!.Name).Attributes.Text("calendar") ?? "standard",
            Provenance.For(o.Command, o.Slice is { } part ? source.FilesOf(part.First, part.End) : source.Files),
            new Dictionary<string, string>
            {
                ["title"] = $"Area-weighted statistics of {o.Variable} per region",
                ["earth_radius_m"] = o.EarthRadius.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
                ["min_valid"] = o.MinValid.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
                ["quantile_definition"] = "area-weighted, Hazen plotting positions (Hyndman & Fan 1996 definition 5 for equal weights)",
            });

        using var products = new SeriesProducts(o.Output, o.Table, layout, o.Format);
        var slice = o.Slice ?? FrameSlice.Whole(source.FrameCount);
        if (slice.End > source.FrameCount) throw new ArgumentOutOfRangeException(nameof(o.Slice), $"frames {slice.First}..{slice.End} lie beyond the record's {source.FrameCount}");
        var op = new RegionStatisticsOperator(mask, plan, statistics, o.MinValid, source.Times, products);
        FrameEngine.Run(source, Enumerable.Range(slice.First, slice.Count).ToArray(), op, new EngineSettings(o.Workers, progress));
        products.Complete();
        return new StatsSummary(slice.Count, mask.Count, (long)slice.Count * mask.Count * statistics.Length, op.BelowMinValid, op.NoData, grid, mask);
    }

    static SeriesQuantity Quantity(RegionStatistic s, string variable, string units) => s switch
    {
        RegionStatistic.Mean => new("mean", $"area-weighted mean of {variable}", units, "area: mean"),
        RegionStatistic.Std => new("std", $"area-weighted standard deviation of {variable}", units, "area: standard_deviation"),
        RegionStatistic.Min => new("min", $"minimum of {variable} over the region", units, "area: minimum"),
        RegionStatistic.Max => new("max", $"maximum of {variable} over the region", units, "area: maximum"),
        RegionStatistic.P50 => new("p50", $"area-weighted median of {variable}", units, "area: median"),
        // CF cell_methods has no percentile method: the long name says what it is.
        RegionStatistic.P10 => new("p10", $"area-weighted 10th percentile of {variable}", units, ""),
        RegionStatistic.P90 => new("p90", $"area-weighted 90th percentile of {variable}", units, ""),
        _ => throw new ArgumentOutOfRangeException(nameof(s)),
    };
}
