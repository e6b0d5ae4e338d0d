using System.Globalization;
using GridDrift.Conventions.Coordinates;
using GridDrift.Conventions.Time;
using GridDrift.Formats;
using GridDrift.Formats.Classic;
using GridDrift.Frames;
using GridDrift.Grids;
using GridDrift.Outputs;
using GridDrift.Outputs.Series;
using GridDrift.Regions;
using GridDrift.Operators.Similarity;
using GridDrift.Operators.Statistics;
using GridDrift.Results;

namespace GridDrift.Workflows;

internal sealed record SimilarityOptions(
    IReadOnlyList<string> Inputs,
    string Variable,
    IReadOnlyList<string> Regions,
    IReadOnlyList<SimilarityMetric> Metrics,
    string Output,
    string? Table = null,
    int Lag = 1,
    string? Range = null,
    bool AcrossGaps = false,
    string? Against = null,
    double MinValid = 0.5,
    double EarthRadius = Sphere.MeanEarthRadius,
    ClassicVariant? Format = null,
    string Command = "griddrift similarity",
    int Workers = 0,
    IReadOnlyList<string>? Reference = null,
    string? Units = null,
    FrameSlice? Slice = null)
{
    /// <summary>Which frames of the record to read (`--period`; [input] period).</summary>
    public FrameSelection Selection { get; init; } = FrameSelection.All;
}

internal sealed record SimilaritySummary(int Pairs, IReadOnlyList<(CfTime Earlier, CfTime Later)> Skipped, DataRange Range, long CellsOutsideRange, int Regions, IReadOnlyList<string> Warnings);

/// <summary>
/// `griddrift similarity`: pair metrics per region over a record — consecutive frames (lag k)
/// or each frame against a fixed reference field. Each frame is read once into a ring of
/// lag + workers buffers; the pairs of a batch are computed on the workers and written in time
/// order, so memory is bounded by the frames in flight, not by the record's length.
/// </summary>
internal static class SimilarityStep
{
    public static SimilaritySummary Run(SimilarityOptions o, IProgress<(int Done, int Total)>? progress = null)
    {
        if (o.Lag < 1) throw new BadInputException(null, null, "--lag must be at least 1");
        using var record = GridRecord.Open(o.Inputs, o.Variable, o.Units, o.EarthRadius, o.Selection);
        var source = record.Source;
        var range = record.DynamicRange(o.Range);
        var regions = record.Regions([.. o.Regions]);
        float[]? reference = o.Against is null ? null : ReadReference(o.Against, o.Variable, record.Grid);
        // the reference in the candidate's units (K against degC, g/kg against kg kg-1)
        using var observed = o.Reference is { Count: > 0 } ? GridRecord.Open(o.Reference, o.Variable, record.Units, o.EarthRadius, o.Selection) : null;
        List<FramePair> pairs;
        List<(CfTime Earlier, CfTime Later)> skipped = [];
        if (observed is not null) pairs = record.SharedTimes(observed);
        else if (reference is not null) pairs = FramePairs.AgainstFixed(source.FrameCount);
        else pairs = FramePairs.AtLag(source, o.Lag, o.AcrossGaps, out skipped);
        if (o.Slice is { } slice)
        {
            // a shard owns the pairs whose later frame is its own; the earlier frame may lie in the slice before
            pairs = pairs.Where(p => slice.Contains(p.Later)).ToList();
            skipped = slice.Count == 0 ? [] : skipped.Where(s => s.Later >= source.Times[slice.First] && s.Later <= source.Times[slice.End - 1]).ToList();
        }

        // a shard reads its slice and the lag frames before it: its provenance names those files only
        var read = o.Slice is { } owned ? source.FilesOf(owned.First - (reference is null && observed is null ? o.Lag : 0), owned.End) : source.Files;
        string title = observed is not null ? $"Comparison of {o.Variable}: candidate {Path.GetFileName(source.Files[0])} against reference {Path.GetFileName(observed.Files[0])}"
            : reference is null ? $"Frame-to-frame similarity of {o.Variable} per region (lag {o.Lag})" : $"Similarity of each frame of {o.Variable} to {Path.GetFileName(o.Against)}";
        var layout = record.PairLayout(regions, o.Metrics, range, o.MinValid,
            Provenance.For(o.Command, observed is not null ? [.. observed.Files, .. read] : o.Against is null ? read : [.. read, o.Against]),
            title, o.Lag, skipped, withBounds: reference is null && observed is null);
        using var products = new SeriesProducts(o.Output, o.Table, layout, o.Format);
        long outside = record.Pairs(regions, o.Metrics, range, o.MinValid, pairs, products, new EngineSettings(o.Workers, progress), observed, reference);
        products.Complete();
        return new SimilaritySummary(pairs.Count, skipped, range, outside, regions.Count, [.. record.Warnings, .. observed?.Warnings ?? []]);
    }

    static float[] ReadReference(string path, string variable, Grid grid)
    {
        using var reader = DatasetFiles.Open(path);
        var v = reader.RequireVariable(variable);
        var axes = VariableAxes.Discover(reader, v);
        int timeDim = axes.IndexOf(AxisRole.Time);
        if (timeDim >= 0 && v.Dimensions[timeDim].Length != 1)
            throw new BadInputException(path, variable, $"has {v.Dimensions[timeDim].Length} time steps; --against needs one fixed field");
        if (v.ElementCount != grid.CellCount)
            throw new BadInputException(path, variable, $"has {v.ElementCount} values; the record's grid has {grid.CellCount} cells");
        var raw = reader.ReadAllDoubles(v);
        var field = new float[raw.Length];
        GridDrift.Conventions.Values.ValueCodec.For(v).Decode(raw, field);
        return field;
    }
}
