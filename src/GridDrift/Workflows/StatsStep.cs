using GridDrift.Conventions.Coordinates;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Series;
using GridDrift.Regions;
using GridDrift.Operators.Statistics;
using GridDrift.Results;

namespace GridDrift.Workflows;

internal sealed record StatsOptions(
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
    FrameSlice? Slice = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

/// <summary>What a stats run did, for the summary line and for tests.</summary>
internal sealed record StatsSummary(int Frames, int Regions, long Values, long BelowMinValid, long NoData, Grid Grid, IReadOnlyList<string> Warnings);

/// <summary>
/// `griddrift stats`: area-weighted statistics per frame and region, streamed. Frames are read
/// and reduced by a pool of workers, one frame each, and written in time order; frames in
/// flight are bounded by the worker count, so memory does not grow with the record.
/// </summary>
internal static class StatsStep
{
    public static StatsSummary Run(StatsOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        using var record = GridRecord.Open(o.Inputs, o.Variable, o.Units, o.EarthRadius, o.Selection);
        var regions = record.Regions([.. o.Regions]);
        var statistics = GridRecord.StatisticsOf(o.Statistics);
        var slice = o.Slice ?? FrameSlice.Whole(record.FrameCount);
        if (slice.End > record.FrameCount) throw new ArgumentOutOfRangeException(nameof(o.Slice), $"frames {slice.First}..{slice.End} lie beyond the record's {record.FrameCount}");
        var layout = record.StatisticsLayout(regions, statistics, o.MinValid, o.Command, o.Slice is { } part ? record.Source.FilesOf(part.First, part.End) : record.Files);
        using var products = new SeriesProducts(o.Output, o.Table, layout, o.Format);
        var (below, noData) = record.RegionStatistics(regions, statistics, o.MinValid, products, slice, new EngineSettings(o.Workers, progress));
        products.Complete();
        var grid = record.Grid;
        return new StatsSummary(slice.Count, regions.Count, (long)slice.Count * regions.Count * statistics.Length, below, noData, grid, record.Warnings);
    }
}
